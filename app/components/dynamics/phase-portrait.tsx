// A phase portrait: one species against another along the simulated trajectory.
import { useState } from "react";
import { readableNumberText } from "~/chem/numbers";

export function PhasePortrait({ series }: { series: Record<string, number[]> }) {
  const names = Object.keys(series);
  const [x, setX] = useState(names[0] ?? "");
  const [y, setY] = useState(names[1] ?? names[0] ?? "");
  if (names.length < 2) return <p className="text-sm text-muted">A phase portrait needs two species.</p>;
  const xs = series[x] ?? [];
  const ys = series[y] ?? [];
  const [w, h, pad] = [420, 300, 36];
  const bounds = (v: number[]) => {
    const lo = Math.min(...v);
    const hi = Math.max(...v);
    return hi > lo ? [lo, hi] : [lo - 1, hi + 1];
  };
  const [x0, x1] = bounds(xs);
  const [y0, y1] = bounds(ys);
  const px = (v: number) => pad + ((v - x0) / (x1 - x0)) * (w - 2 * pad);
  const py = (v: number) => h - pad - ((v - y0) / (y1 - y0)) * (h - 2 * pad);
  const path = xs.map((v, i) => `${i ? "L" : "M"}${px(v).toFixed(1)},${py(ys[i]).toFixed(1)}`).join("");
  const pick = (value: string, set: (v: string) => void, label: string) => (
    <select className="field w-auto py-1" value={value} onChange={(e) => set(e.target.value)} aria-label={label}>
      {names.map((n) => <option key={n}>{n}</option>)}
    </select>
  );
  return (
    <figure>
      <div className="flex items-center gap-2 text-sm">{pick(y, setY, "vertical species")} against {pick(x, setX, "horizontal species")}</div>
      <svg viewBox={`0 0 ${w} ${h}`} className="mt-2 w-full max-w-xl" role="img" aria-label={`${y} against ${x}`}>
        <rect x={pad} y={pad} width={w - 2 * pad} height={h - 2 * pad} fill="none" stroke="var(--mw-line)" />
        <path d={path} fill="none" stroke="var(--mw-accent)" strokeWidth="1.6" />
        <circle cx={px(xs[0])} cy={py(ys[0])} r="4" fill="var(--mw-signal)"><title>start</title></circle>
        <circle cx={px(xs.at(-1)!)} cy={py(ys.at(-1)!)} r="4" fill="var(--mw-accent)"><title>end</title></circle>
        <text x={w / 2} y={h - 8} textAnchor="middle" fontSize="12" fill="var(--mw-muted)">{x} ({readableNumberText(x0, 3)} – {readableNumberText(x1, 3)})</text>
        <text x={12} y={h / 2} textAnchor="middle" fontSize="12" fill="var(--mw-muted)" transform={`rotate(-90 12 ${h / 2})`}>{y} ({readableNumberText(y0, 3)} – {readableNumberText(y1, 3)})</text>
      </svg>
    </figure>
  );
}
