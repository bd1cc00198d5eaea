// Names across the boundary: SBML identifiers (SIds) are `[A-Za-z_][A-Za-z0-9_]*` and share one
// namespace per model, `.weave` identifiers are `[A-Za-z][A-Za-z0-9_]*` while species may also be
// quoted free text. Each side gets unique, valid names; the originals travel in `name` attributes.

const sidPattern = /^[A-Za-z_][A-Za-z0-9_]*$/;
const weaveIdentifierPattern = /^[A-Za-z][A-Za-z0-9_]*$/;

export function isSId(text: string): boolean {
  return sidPattern.test(text);
}

export function isWeaveIdentifier(text: string): boolean {
  return weaveIdentifierPattern.test(text) && text !== "fixed";
}

/** Readable SId spelling of any text: "Fe3+" → "Fe3_plus", "H2O (l)" → "H2O_l", "2-butene" → "s_2_minus_butene". */
export function toSId(text: string): string {
  const spelled = text
    .replace(/\+/g, "_plus_")
    .replace(/-/g, "_minus_")
    .replace(/[^A-Za-z0-9_]/g, "_")
    .replace(/__+/g, "_")
    .replace(/(.)_$/, "$1");
  if (spelled === "" || spelled === "_") return "s";
  return /^[0-9]/.test(spelled) ? `s_${spelled}` : spelled;
}

/** A `.weave` identifier for any text: an SId without its leading underscores, or with a letter in front. */
export function toWeaveIdentifier(text: string): string {
  const sid = toSId(text).replace(/^_+/, "");
  return weaveIdentifierPattern.test(sid) ? sid : `x${sid}`;
}

/**
 * Hands out unique names in one namespace, after shaping each wish into an allowed name; a
 * clash gets a numeric suffix, which keeps identifiers and quoted names valid.
 */
export class NameAllocator {
  private readonly taken: Set<string>;

  constructor(
    private readonly shape: (wish: string) => string = (wish) => wish,
    reserved: Iterable<string> = [],
  ) {
    this.taken = new Set(reserved);
  }

  take(wish: string): string {
    const base = this.shape(wish);
    let name = base;
    for (let n = 2; this.taken.has(name); n++) name = `${base}_${n}`;
    this.taken.add(name);
    return name;
  }
}
