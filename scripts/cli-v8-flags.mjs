// V8 flags for the command line, a short-lived process whose first simulation would otherwise run
// mostly in the interpreter. The CLI bundle's entry (build/mechweave-cli.js, written by
// scripts/bundle.mjs) sets them with `v8.setFlagsFromString` before it imports the main chunk, so
// they apply to every function of ours, which V8 compiles lazily on first call; scripts/cli.mjs
// passes them to node when it runs the source under tsx.
// - `--no-lazy-feedback-allocation`: a function gets its inline caches and call counts from its
//   first call instead of after several, so property loads are fast and the stepping code reaches
//   the optimising compiler sooner.
// - `--always-sparkplug`: every function is compiled at once to baseline machine code (fast to make,
//   no interpreter dispatch) while the optimising compiler is still busy with the hot ones.
// Measured in README (dynamics from a cold process).
export const CLI_V8_FLAGS = ["--no-lazy-feedback-allocation", "--always-sparkplug"];
