// `npm run -s mechweave -- COMMAND ...`: a thin dispatcher; each command lives in its own module
// exporting `run(args): Promise<number>` (the exit code). Exit 2 means bad usage.
const commands: Record<string, () => Promise<{ run(args: string[]): Promise<number> }>> = {
  analyze: () => import("./analyze"),
  simulate: () => import("./simulate"),
  lyapunov: () => import("./lyapunov"),
  realize: () => import("./realize"),
};

const usage = `usage: mechweave <command> FILE [options]
commands:
  analyze FILE [--json]                                   network structure
  simulate FILE --until T --samples N [--rtol R --atol A] [--json]
  lyapunov FILE --until T [--json]                        largest Lyapunov exponent
  realize ODEFILE [--shift x=20,y=30] [--multiply] [--json]`;

async function main(): Promise<number> {
  const [name, ...rest] = process.argv.slice(2);
  const load = name ? commands[name] : undefined;
  if (!load) {
    process.stderr.write(usage + "\n");
    return 2;
  }
  try {
    return await (await load()).run(rest);
  } catch (error) {
    process.stderr.write(`mechweave ${name}: ${error instanceof Error ? error.message : String(error)}\n`);
    return 2;
  }
}

main().then((code) => process.exit(code));
