// XML as a small namespace-aware element tree, read and written with fast-xml-parser. SBML and
// MathML are order-sensitive (an <apply>'s first child is its operator), so the parser keeps
// document order and this module hides its array-of-single-key-objects shape.
import { XMLBuilder, XMLParser, XMLValidator } from "fast-xml-parser";

export interface XmlElement {
  /** Local name, without any namespace prefix. */
  name: string;
  /** Namespace URI in scope for the element, "" when none is declared. */
  namespace: string;
  /** Attributes by qualified name as written (`level`, `xmlns:m`, `sbml:units`). */
  attributes: Record<string, string>;
  children: XmlElement[];
  /** The element's own text nodes in order (`1`, `-3` around the <sep/> of an e-notation <cn>). */
  texts: string[];
  /** The text nodes joined, trimmed. */
  text: string;
}

export type XmlReading = { ok: true; root: XmlElement } | { ok: false; error: string };

type OrderedNode = Record<string, unknown> & { ":@"?: Record<string, string> };

/** Deeper than any real kinetic law, shallow enough that no reader here runs out of stack. */
const maxDepth = 200;

const parser = new XMLParser({
  preserveOrder: true,
  ignoreAttributes: false,
  attributeNamePrefix: "",
  parseTagValue: false,
  parseAttributeValue: false,
  trimValues: true,
  htmlEntities: true,
  commentPropName: false,
  maxNestedTags: maxDepth,
});

export function readXml(text: string): XmlReading {
  // Entity declarations are never needed by SBML and are the way to an expansion bomb.
  if (/<!ENTITY/i.test(text)) return { ok: false, error: "The file declares XML entities (<!ENTITY>), which are not accepted." };
  const validation = XMLValidator.validate(text);
  if (validation !== true) {
    const { msg, line, col } = validation.err;
    const where = line ? ` (line ${line}${col ? `, column ${col}` : ""})` : "";
    return { ok: false, error: `The file is not well-formed XML${where}: ${msg}` };
  }
  let nodes: OrderedNode[];
  try {
    nodes = parser.parse(text) as OrderedNode[];
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    if (/nested/i.test(message)) return { ok: false, error: `The file nests elements more than ${maxDepth} deep, which Mechweave does not read.` };
    return { ok: false, error: `The file cannot be read as XML: ${message}` };
  }
  const roots = nodes.filter((node) => !tagOf(node).startsWith("?"));
  if (roots.length !== 1) return { ok: false, error: "The file is not well-formed XML: it must have exactly one root element." };
  return { ok: true, root: toElement(roots[0], new Map([["", ""]])) };
}

function tagOf(node: OrderedNode): string {
  return Object.keys(node).find((key) => key !== ":@")!;
}

function toElement(node: OrderedNode, inherited: Map<string, string>): XmlElement {
  const tag = tagOf(node);
  const attributes = node[":@"] ?? {};
  let scope = inherited;
  for (const [key, value] of Object.entries(attributes)) {
    if (key === "xmlns" || key.startsWith("xmlns:")) {
      if (scope === inherited) scope = new Map(inherited);
      scope.set(key === "xmlns" ? "" : key.slice(6), value);
    }
  }
  const colon = tag.indexOf(":");
  const prefix = colon < 0 ? "" : tag.slice(0, colon);
  const children: XmlElement[] = [];
  const texts: string[] = [];
  for (const child of node[tag] as OrderedNode[]) {
    if ("#text" in child) texts.push(String(child["#text"]));
    else children.push(toElement(child, scope));
  }
  return { name: tag.slice(colon + 1), namespace: scope.get(prefix) ?? "", attributes, children, texts, text: texts.join(" ").trim() };
}

/** The first child with the given local name, if any. */
export function child(element: XmlElement, name: string): XmlElement | undefined {
  return element.children.find((each) => each.name === name);
}

/** Children of the named list element (`listOfSpecies` → its `species`), or none. */
export function listed(element: XmlElement, list: string, item: string): XmlElement[] {
  return child(element, list)?.children.filter((each) => each.name === item) ?? [];
}

// ---- writing

/** An element to write: attributes with undefined values are left out. */
export interface XmlOut {
  name: string;
  attributes?: Record<string, string | number | boolean | undefined>;
  children?: (XmlOut | string)[];
}

const builder = new XMLBuilder({
  preserveOrder: true,
  ignoreAttributes: false,
  attributeNamePrefix: "",
  format: true,
  indentBy: "  ",
  suppressEmptyNode: true,
});

export function writeXml(root: XmlOut): string {
  return `<?xml version="1.0" encoding="UTF-8"?>\n${(builder.build([toOrdered(root)]) as string).trim()}\n`;
}

function toOrdered(element: XmlOut): OrderedNode {
  const attributes: Record<string, string> = {};
  for (const [key, value] of Object.entries(element.attributes ?? {})) if (value !== undefined) attributes[key] = String(value);
  const children = (element.children ?? []).map((each) => (typeof each === "string" ? { "#text": each } : toOrdered(each)));
  return Object.keys(attributes).length > 0 ? { [element.name]: children, ":@": attributes } : { [element.name]: children };
}
