// Time courses (and sweep results) with uPlot: readable ticks from 1e-12 to 1e12, linear or
// logarithmic axes, drag to zoom (double-click resets), measured points overlaid as markers, our
// own legend with a toggle per series and the values under the cursor, SVG and PNG downloads.
import { useEffect, useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { readableNumberText, tickLabels } from "~/chem/numbers";
import { currentThemeColours } from "~/utils/graph-svg";
import { PictureDownloads } from "../picture-downloads";
import { linearRange, linearTicks, logRange, logTickLabels, logTicks } from "./chart-scales";
import { chartSvg, type ChartSeries } from "./chart-svg";
import { seriesLook, type SeriesLook } from "./palette";

export interface Measured {
  time: number[];
  series: Record<string, (number | null)[]>;
}

interface Props {
  t: number[];
  series: Record<string, number[]>;
  logTime: boolean;
  measured?: Measured | null;
  height?: number;
  /** Names the horizontal axis and the value under the cursor: "time", or the swept quantity. */
  xLabel?: string;
  yLabel?: string;
  /** How the overlaid points are named in the legend. */
  overlayLabel?: string;
  /** The downloads' file name, without extension. */
  fileName?: string;
}

interface Plotted extends ChartSeries {
  /** The series it belongs to, for the toggle: a measured overlay goes with its species. */
  of: string;
}

export function TimeCourseChart({
  t,
  series,
  logTime,
  measured,
  height = 340,
  xLabel = "time",
  yLabel = "concentration",
  overlayLabel = "measured",
  fileName = "time-course",
}: Props) {
  const host = useRef<HTMLDivElement>(null);
  const chart = useRef<uPlot | null>(null);
  const [hidden, setHidden] = useState<ReadonlySet<string>>(new Set());
  const [logY, setLogY] = useState(false);
  const [cursor, setCursor] = useState<number | null>(null);

  const names = useMemo(() => Object.keys(series), [series]);
  // A look belongs to a series by its place among all series, so hiding one recolours nothing.
  const looks = useMemo(() => new Map<string, SeriesLook>(names.map((name, index) => [name, seriesLook(index)])), [names]);
  const plot = useMemo(() => plotData(t, series, measured ?? null, logTime, logY, hidden, looks, overlayLabel), [t, series, measured, logTime, logY, hidden, looks, overlayLabel]);

  useEffect(() => {
    const element = host.current;
    if (!element) return;
    let cancelled = false;
    // uPlot touches the DOM when loaded, so it is loaded in the browser only.
    void import("uplot").then(({ default: UPlot }) => {
      if (cancelled) return;
      const style = getComputedStyle(document.documentElement);
      const ink = style.getPropertyValue("--mw-muted").trim();
      const grid = style.getPropertyValue("--mw-line").trim();
      // The labels drawn on the canvas are also left on the element, where a reader of the page finds them.
      const labels = (log: boolean, key: "xTicks" | "yTicks") => (_: uPlot, splits: number[]) => {
        const written = log ? logTickLabels(splits) : tickLabels(splits);
        element.dataset[key] = written.filter(Boolean).join(" | ");
        return written;
      };
      // Our ticks, not uPlot's: its steps stop at 10^-16, so a trace at 1e-20 had none. A log axis
      // gets its ticks and grid at powers of ten only, not at every 2, 3, … 9 between.
      const splits = (log: boolean) => (u: uPlot, index: number) => {
        const scale = u.scales[index === 0 ? "x" : "y"];
        const range = { min: scale.min!, max: scale.max! };
        return log ? logTicks(range) : linearTicks(range);
      };
      const axis = { stroke: ink, grid: { stroke: grid, width: 1 }, ticks: { stroke: grid }, font: "11px IBM Plex Sans, system-ui, sans-serif" };
      chart.current = new UPlot(
        {
          width: element.clientWidth,
          height,
          scales: {
            x: { time: false, distr: logTime ? 3 : 1, log: 10 },
            y: {
              distr: logY ? 3 : 1,
              log: 10,
              range: (_, min, max) => {
                const range = logY ? logRange(min, max) : linearRange(min, max);
                return [range.min, range.max];
              },
            },
          },
          axes: [
            { ...axis, label: xLabel, values: labels(logTime, "xTicks"), splits: splits(logTime) },
            { ...axis, label: yLabel, values: labels(logY, "yTicks"), splits: splits(logY), size: (_, values) => 30 + 7 * Math.max(3, ...(values ?? []).map((value) => value.length)) },
          ],
          cursor: { drag: { x: true, y: true } },
          legend: { show: false },
          hooks: { setCursor: [(u) => setCursor(u.cursor.idx ?? null)] },
          series: [
            {},
            ...plot.series.map((each) =>
              each.markers
                ? { label: each.name, stroke: each.colour, width: 0, paths: () => null, points: { show: true, size: 7, fill: each.colour } }
                : { label: each.name, stroke: each.colour, dash: each.dash, width: 2, spanGaps: true, points: { show: false } },
            ),
          ],
        },
        [plot.x, ...plot.series.map((each) => each.values)] as uPlot.AlignedData,
        element,
      );
    });
    const resize = new ResizeObserver(() => chart.current?.setSize({ width: element.clientWidth, height }));
    resize.observe(element);
    return () => {
      cancelled = true;
      resize.disconnect();
      chart.current?.destroy();
      chart.current = null;
      setCursor(null);
    };
  }, [plot, logTime, logY, height, xLabel, yLabel]);

  function picture() {
    const shown = chart.current;
    const x = { min: shown?.scales.x.min ?? Math.min(...plot.x), max: shown?.scales.x.max ?? Math.max(...plot.x) };
    const y = { min: shown?.scales.y.min ?? 0, max: shown?.scales.y.max ?? 1 };
    return chartSvg(
      {
        width: host.current?.clientWidth || 720,
        height,
        x: { ...x, log: logTime, label: xLabel, values: plot.x },
        y: { ...y, log: logY, label: yLabel },
        series: plot.series,
      },
      currentThemeColours(),
    );
  }

  const toggle = (name: string) =>
    setHidden((previous) => {
      const next = new Set(previous);
      if (!next.delete(name)) next.add(name);
      return next;
    });
  const at = (values: (number | null)[]) => (cursor === null || values[cursor] == null ? "—" : readableNumberText(values[cursor]!, 3));

  return (
    <figure className="space-y-2">
      <div className="flex flex-wrap items-center justify-end gap-3 text-xs">
        <label className="flex items-center gap-1.5">
          <input type="checkbox" checked={logY} onChange={(e) => setLogY(e.target.checked)} /> log {yLabel} axis
        </label>
        <PictureDownloads svg={picture} name={fileName} />
      </div>
      <div ref={host} className="mw-chart w-full" data-testid="time-course-chart" />
      <figcaption className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs" data-testid="chart-legend">
        <span className="font-mono text-muted">
          {xLabel} = {cursor === null ? "—" : readableNumberText(plot.x[cursor], 4)}
        </span>
        {names.map((name) => {
          const look = looks.get(name)!;
          const line = plot.series.find((each) => each.of === name && !each.markers);
          return (
            <label key={name} className="inline-flex cursor-pointer items-center gap-1" title={hidden.has(name) ? `show ${name}` : `hide ${name}`}>
              <input type="checkbox" className="sr-only" checked={!hidden.has(name)} onChange={() => toggle(name)} />
              <Swatch look={look} faded={hidden.has(name)} />
              <span className={hidden.has(name) ? "text-muted line-through" : ""}>{name}</span>
              {line && cursor !== null && <span className="font-mono text-muted">{at(line.values)}</span>}
            </label>
          );
        })}
        {names.length > 4 && (
          <span className="inline-flex gap-1">
            <button type="button" className="underline decoration-dotted" onClick={() => setHidden(new Set())}>show all</button>
            <button type="button" className="underline decoration-dotted" onClick={() => setHidden(new Set(names))}>hide all</button>
          </span>
        )}
      </figcaption>
    </figure>
  );
}

function Swatch({ look, faded }: { look: SeriesLook; faded: boolean }) {
  return (
    <svg width="24" height="10" aria-hidden="true" style={{ opacity: faded ? 0.3 : 1 }}>
      <line x1="0" y1="5" x2="24" y2="5" stroke={look.colour} strokeWidth="2" strokeDasharray={look.dash.join(" ") || undefined} />
    </svg>
  );
}

/**
 * The shown series on one x grid. A log axis cannot show zero or less: the time axis starts at the
 * first positive sample and a log value axis leaves such values out.
 */
function plotData(
  t: number[],
  series: Record<string, number[]>,
  measured: Measured | null,
  logTime: boolean,
  logY: boolean,
  hidden: ReadonlySet<string>,
  looks: Map<string, SeriesLook>,
  overlayLabel: string,
): { x: number[]; series: Plotted[] } {
  const first = logTime ? Math.max(0, t.findIndex((x) => x > 0)) : 0;
  const times = t.slice(first);
  const visible = Object.keys(series).filter((name) => !hidden.has(name));
  const shownValue = (value: number | null) => (value === null || !Number.isFinite(value) || (logY && value <= 0) ? null : value);
  const lines: Plotted[] = visible.map((name) => ({ name, of: name, ...looks.get(name)!, values: series[name].slice(first).map(shownValue) }));
  const overlaid = measured ? Object.keys(measured.series).filter((name) => visible.includes(name)) : [];
  if (!measured || overlaid.length === 0) return { x: times, series: lines };

  // Measured points sit on their own x positions: merge the two time grids.
  const merged = [...new Set([...times, ...measured.time.filter((x) => !logTime || x > 0)])].sort((a, b) => a - b);
  const index = new Map(merged.map((x, i) => [x, i]));
  const spread = (values: (number | null)[], at: number[]) => {
    const out: (number | null)[] = new Array(merged.length).fill(null);
    at.forEach((x, i) => {
      if (index.has(x)) out[index.get(x)!] = values[i];
    });
    return out;
  };
  return {
    x: merged,
    series: [
      ...lines.map((line) => ({ ...line, values: spread(line.values, times) })),
      ...overlaid.map((name) => ({
        name: `${name} (${overlayLabel})`,
        of: name,
        ...looks.get(name)!,
        markers: true,
        values: spread(measured.series[name].map(shownValue), measured.time),
      })),
    ],
  };
}
