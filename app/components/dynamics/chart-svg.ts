// A chart as a standalone SVG file (and, rasterised, the PNG download): the visible series over
// the range on screen, with the same ticks, colours, dashes and legend.
import { tickLabels } from "~/chem/numbers";
import type { ThemeColours } from "~/utils/graph-svg";
import { linearTicks, logTickLabels, logTicks, type Range } from "./chart-scales";
import type { SeriesLook } from "./palette";

export interface ChartAxis extends Range {
  log: boolean;
  label: string;
}

export interface ChartSeries extends SeriesLook {
  name: string;
  values: (number | null)[];
  /** Drawn as separate markers (measured points), not as a line. */
  markers?: boolean;
}

export interface ChartPicture {
  width: number;
  height: number;
  x: ChartAxis & { values: number[] };
  y: ChartAxis;
  series: ChartSeries[];
}

const escapeXml = (text: string) => text.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);
const font = `font-family="IBM Plex Sans, system-ui, sans-serif"`;
const plot = { left: 78, right: 16, top: 14, bottom: 46 };
const legendRow = 18;
const legendColumn = 150;

export function chartSvg(picture: ChartPicture, theme: ThemeColours): string {
  const ink = theme["--mw-ink"] ?? "#1f2328";
  const muted = theme["--mw-muted"] ?? "#5f6670";
  const line = theme["--mw-line"] ?? "#ddd6c8";
  const { width, x, y, series } = picture;
  const perRow = Math.max(1, Math.floor((width - plot.left) / legendColumn));
  const legendHeight = Math.ceil(series.length / perRow) * legendRow + 8;
  const height = picture.height + legendHeight;
  const right = width - plot.right;
  const bottom = picture.height - plot.bottom;

  const scale = (axis: ChartAxis, from: number, to: number) => {
    const at = (v: number) => (axis.log ? Math.log10(v) : v);
    const [low, high] = [at(axis.min), at(axis.max)];
    return (value: number) => from + ((at(value) - low) / (high - low)) * (to - from);
  };
  const px = scale(x, plot.left, right);
  const py = scale(y, bottom, plot.top);
  const inside = (axis: ChartAxis, v: number | null): v is number =>
    v !== null && Number.isFinite(v) && (!axis.log || v > 0) && v >= axis.min && v <= axis.max;

  const ticks = (axis: ChartAxis) => {
    const at = axis.log ? logTicks(axis) : linearTicks(axis);
    const labels = axis.log ? logTickLabels(at) : tickLabels(at);
    return at.map((value, index) => ({ value, label: labels[index] }));
  };
  const xTicks = ticks(x).map(
    ({ value, label }) =>
      `<line x1="${px(value)}" y1="${plot.top}" x2="${px(value)}" y2="${bottom}" stroke="${line}"/>` +
      `<text x="${px(value)}" y="${bottom + 16}" text-anchor="middle" font-size="11" fill="${muted}" ${font}>${escapeXml(label)}</text>`,
  );
  const yTicks = ticks(y).map(
    ({ value, label }) =>
      `<line x1="${plot.left}" y1="${py(value)}" x2="${right}" y2="${py(value)}" stroke="${line}"/>` +
      `<text x="${plot.left - 6}" y="${py(value) + 4}" text-anchor="end" font-size="11" fill="${muted}" ${font}>${escapeXml(label)}</text>`,
  );

  const drawn = series.map((each) => {
    const points = each.values.map((value, index) => (inside(x, x.values[index]) && inside(y, value) ? [px(x.values[index]), py(value)] : null));
    if (each.markers) {
      return points.flatMap((p) => (p ? [`<circle cx="${p[0].toFixed(1)}" cy="${p[1].toFixed(1)}" r="3.5" fill="${each.colour}"/>`] : [])).join("");
    }
    // A gap (a value off the axis, or none) starts a new piece of the line.
    const path = points.map((p, index) => (p ? `${index > 0 && points[index - 1] ? "L" : "M"}${p[0].toFixed(1)},${p[1].toFixed(1)}` : "")).join("");
    const dash = each.dash.length ? ` stroke-dasharray="${each.dash.join(" ")}"` : "";
    return path ? `<path d="${path}" fill="none" stroke="${each.colour}" stroke-width="2"${dash}/>` : "";
  });

  const legend = series.map((each, index) => {
    const left = plot.left + (index % perRow) * legendColumn;
    const top = picture.height + 4 + Math.floor(index / perRow) * legendRow;
    const swatch = each.markers
      ? `<circle cx="${left + 11}" cy="${top + 9}" r="3.5" fill="${each.colour}"/>`
      : `<line x1="${left}" y1="${top + 9}" x2="${left + 22}" y2="${top + 9}" stroke="${each.colour}" stroke-width="2"${each.dash.length ? ` stroke-dasharray="${each.dash.join(" ")}"` : ""}/>`;
    return `${swatch}<text x="${left + 28}" y="${top + 13}" font-size="12" fill="${ink}" ${font}>${escapeXml(each.name)}</text>`;
  });

  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">`,
    `<rect width="${width}" height="${height}" fill="${theme["--mw-raised"] ?? "#fff"}"/>`,
    ...xTicks,
    ...yTicks,
    `<rect x="${plot.left}" y="${plot.top}" width="${right - plot.left}" height="${bottom - plot.top}" fill="none" stroke="${muted}"/>`,
    `<clipPath id="plot"><rect x="${plot.left}" y="${plot.top}" width="${right - plot.left}" height="${bottom - plot.top}"/></clipPath>`,
    `<g clip-path="url(#plot)">${drawn.join("")}</g>`,
    `<text x="${(plot.left + right) / 2}" y="${bottom + 36}" text-anchor="middle" font-size="12" fill="${ink}" ${font}>${escapeXml(x.label)}</text>`,
    `<text x="14" y="${(plot.top + bottom) / 2}" text-anchor="middle" font-size="12" fill="${ink}" ${font} transform="rotate(-90 14 ${(plot.top + bottom) / 2})">${escapeXml(y.label)}</text>`,
    ...legend,
    `</svg>`,
  ].join("\n");
}
