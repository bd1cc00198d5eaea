// The complex graph as a standalone SVG file (and, drawn onto a canvas, a PNG): the same boxes,
// tints, double rims and bowed arrows as on screen, at the positions co-authors share.
import { edgeCurve } from "~/components/graph/edge-geometry";
import { buildGraphModel, type ComplexGraphReport } from "~/components/graph/graph-model";
import { estimateNodeSize, placeComplexes, type XY } from "~/components/graph/layout";
import { linkageClassColours } from "~/components/graph/linkage-colours";

/** Theme colours by CSS variable name (`--mw-ink` …), so the file does not depend on the page. */
export type ThemeColours = Record<string, string>;

const escapeXml = (text: string) => text.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);
const margin = 24;

export function complexGraphSvg(report: ComplexGraphReport, shared: Record<string, XY>, theme: ThemeColours): string {
  const model = buildGraphModel(report);
  const keys = model.nodes.map((n) => n.key);
  const sizeOf = (key: string) => estimateNodeSize(model.nodes[keys.indexOf(key)]?.label ?? key);
  const positions = { ...shared, ...placeComplexes({ keys, reactions: report.reactions, linkageClasses: report.linkageClasses, known: shared, sizeOf }) };
  const resolve = (colour: string) => colour.replace(/var\((--[\w-]+)\)/g, (_, name: string) => theme[name] ?? "#888");
  const boxes = new Map(model.nodes.map((n) => [n.key, { ...positions[n.key], ...sizeOf(n.key) }]));

  const all = [...boxes.values()];
  const minX = Math.min(...all.map((b) => b.x)) - margin;
  const minY = Math.min(...all.map((b) => b.y)) - margin;
  const width = Math.max(...all.map((b) => b.x + b.width)) - minX + margin;
  const height = Math.max(...all.map((b) => b.y + b.height)) - minY + margin;
  const ink = theme["--mw-ink"] ?? "#1f2328";
  const muted = theme["--mw-muted"] ?? "#5f6670";

  const edges = model.edges.map((edge) => {
    const curve = edgeCurve(boxes.get(edge.source)!, boxes.get(edge.target)!, edge.bend);
    const label = edge.label
      ? `<text x="${curve.middle.x}" y="${curve.middle.y - 4}" text-anchor="middle" font-size="11" fill="${muted}">${escapeXml(edge.label)}</text>`
      : "";
    return `<path d="${curve.path}" fill="none" stroke="${muted}" stroke-width="1.4" marker-end="url(#arrow)"/>${label}`;
  });
  const nodes = model.nodes.map((node) => {
    const box = boxes.get(node.key)!;
    const colours = linkageClassColours(node.linkageClass);
    const rim = node.terminal
      ? `<rect x="${box.x - 3}" y="${box.y - 3}" width="${box.width + 6}" height="${box.height + 6}" rx="10" fill="none" stroke="${resolve(colours.outline)}" stroke-width="1.2"/>`
      : "";
    return (
      rim +
      `<rect x="${box.x}" y="${box.y}" width="${box.width}" height="${box.height}" rx="8" fill="${resolve(colours.fill)}" stroke="${resolve(colours.outline)}" stroke-width="1.5"/>` +
      `<text x="${box.x + box.width / 2}" y="${box.y + box.height / 2 + 4.5}" text-anchor="middle" font-family="ui-monospace, monospace" font-size="13.5" fill="${ink}">${escapeXml(node.label)}</text>`
    );
  });
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="${minX} ${minY} ${width} ${height}">`,
    `<defs><marker id="arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="${muted}"/></marker></defs>`,
    `<rect x="${minX}" y="${minY}" width="${width}" height="${height}" fill="${theme["--mw-canvas"] ?? "#fff"}"/>`,
    ...edges,
    ...nodes,
    `</svg>`,
  ].join("\n");
}

/** The page's current theme colours, read from the root element. */
export function currentThemeColours(): ThemeColours {
  const style = getComputedStyle(document.documentElement);
  const names = ["--mw-canvas", "--mw-raised", "--mw-ink", "--mw-muted", "--mw-line", "--mw-accent"];
  return Object.fromEntries(names.map((name) => [name, style.getPropertyValue(name).trim()]));
}

export function downloadBlob(blob: Blob, filename: string) {
  const url = URL.createObjectURL(blob);
  Object.assign(document.createElement("a"), { href: url, download: filename }).click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** Rasterises the SVG at twice its size, for slides and documents. */
export async function svgToPng(svg: string): Promise<Blob> {
  const image = new Image();
  image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`;
  await image.decode();
  const canvas = Object.assign(document.createElement("canvas"), { width: image.width * 2, height: image.height * 2 });
  const context = canvas.getContext("2d")!;
  context.scale(2, 2);
  context.drawImage(image, 0, 0);
  return new Promise((resolve, reject) => canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error("PNG encoding failed"))), "image/png"));
}
