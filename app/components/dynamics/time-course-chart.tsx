// Time courses with uPlot: pick species, linear or logarithmic time, drag to zoom (double-click
// resets), measured points overlaid as markers.
import { useEffect, useRef } from "react";
import type uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { seriesColour } from "./palette";

export interface Measured {
  time: number[];
  series: Record<string, (number | null)[]>;
}

interface Props {
  t: number[];
  series: Record<string, number[]>;
  shown: readonly string[];
  logTime: boolean;
  measured?: Measured | null;
  height?: number;
  xLabel?: string;
  yLabel?: string;
  /** How the overlaid points are named in the legend. */
  overlayLabel?: string;
}

export function TimeCourseChart({ t, series, shown, logTime, measured, height = 340, xLabel = "time", yLabel = "concentration", overlayLabel = "measured" }: Props) {
  const host = useRef<HTMLDivElement>(null);

  useEffect(() => {
    const element = host.current;
    if (!element) return;
    let chart: uPlot | null = null;
    let cancelled = false;
    // uPlot touches the DOM when loaded, so it is loaded in the browser only.
    void import("uplot").then(({ default: UPlot }) => {
      if (cancelled) return;
      const names = Object.keys(series);
      const visible = names.filter((n) => shown.includes(n));
      // A log axis cannot show t = 0: start at the first positive sample.
      const first = logTime ? Math.max(0, t.findIndex((x) => x > 0)) : 0;
      const times = t.slice(first);
      const measuredNames = measured ? Object.keys(measured.series).filter((n) => visible.includes(n)) : [];
      const xs = [...times];
      const data: (number | null)[][] = [xs, ...visible.map((n) => series[n].slice(first))];
      if (measured && measuredNames.length) {
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
        data.splice(0, data.length, merged, ...visible.map((n) => spread(series[n].slice(first), times)), ...measuredNames.map((n) => spread(measured.series[n], measured.time)));
      }
      const style = getComputedStyle(document.documentElement);
      const ink = style.getPropertyValue("--mw-muted").trim();
      const grid = style.getPropertyValue("--mw-line").trim();
      const axis = { stroke: ink, grid: { stroke: grid, width: 1 }, ticks: { stroke: grid } };
      chart = new UPlot(
        {
          width: element.clientWidth,
          height,
          scales: { x: { time: false, distr: logTime ? 3 : 1 } },
          axes: [{ ...axis, label: xLabel }, { ...axis, label: yLabel, size: 64 }],
          cursor: { drag: { x: true, y: true } },
          legend: { show: true },
          series: [
            { label: "t" },
            ...visible.map((name) => ({ label: name, stroke: seriesColour(names.indexOf(name)), width: 2, spanGaps: true, points: { show: false } })),
            ...measuredNames.map((name) => ({
              label: `${name} (${overlayLabel})`,
              stroke: seriesColour(names.indexOf(name)),
              width: 0,
              paths: () => null,
              points: { show: true, size: 7, fill: seriesColour(names.indexOf(name)) },
            })),
          ],
        },
        data as uPlot.AlignedData,
        element,
      );
    });
    const resize = new ResizeObserver(() => chart?.setSize({ width: element.clientWidth, height }));
    resize.observe(element);
    return () => {
      cancelled = true;
      resize.disconnect();
      chart?.destroy();
    };
  }, [t, series, shown, logTime, measured, height, xLabel, yLabel, overlayLabel]);

  return <div ref={host} className="mw-chart w-full" data-testid="time-course-chart" />;
}
