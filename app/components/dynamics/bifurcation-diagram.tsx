// A bifurcation diagram: one species' equilibrium value against the varied quantity along a
// continued branch, stable pieces solid and unstable ones dashed, folds and Hopf points marked
// and numbered (each label haloed in the card's colour, so it stays readable where a branch
// passes under it). The branch may turn back at a fold, so the points are drawn in branch order, not
// sorted by value. Presentational: it shows a ContinuationResult.
import type { Bifurcation, ContinuationPoint, ContinuationResult } from "~/chem/kinetics/continuation";
import { readableNumberText, tickLabels } from "~/chem/numbers";
import { linearRange, linearTicks, logRange, logTickLabels, logTicks, type Range, spansDecades } from "./chart-scales";

/** A stretch of the branch with one stability; neighbouring pieces share their end point. */
export interface BranchPiece {
  stable: boolean | null;
  points: { x: number; y: number }[];
}

export function branchPieces(points: ContinuationPoint[], species: string): BranchPiece[] {
  const pieces: BranchPiece[] = [];
  points.forEach((point, index) => {
    const at = { x: point.value, y: point.state[species] };
    const current = pieces.at(-1);
    if (current && current.stable === point.stable) current.points.push(at);
    else pieces.push({ stable: point.stable, points: index > 0 ? [current!.points.at(-1)!, at] : [at] });
  });
  return pieces;
}

/** "F1", "F2", … for folds and "H1", … for Hopf points, in the order found along the branch. */
export function bifurcationLabels(bifurcations: Bifurcation[]): string[] {
  const counts = { fold: 0, hopf: 0 };
  return bifurcations.map((b) => `${b.kind === "fold" ? "F" : "H"}${++counts[b.kind]}`);
}

const size = { width: 640, height: 340 };
const plot = { left: 64, right: 16, top: 14, bottom: 44 };

interface Props {
  result: ContinuationResult;
  species: string;
  xLabel: string;
}

export function BifurcationDiagram({ result, species, xLabel }: Props) {
  const pieces = branchPieces(result.points, species);
  const labels = bifurcationLabels(result.bifurcations);
  const xs = result.points.map((p) => p.value);
  const ys = result.points.map((p) => p.state[species]);
  // A branch followed over decades (the default range is a decade either side of the value) is drawn on a log axis.
  const logX = spansDecades(Math.min(...xs), Math.max(...xs));
  const xRange = logX ? logRange(Math.min(...xs), Math.max(...xs)) : linearRange(Math.min(...xs), Math.max(...xs));
  const yRange = linearRange(Math.min(...ys), Math.max(...ys));
  const right = size.width - plot.right;
  const bottom = size.height - plot.bottom;
  const scale = (range: Range, from: number, to: number) => (v: number) => from + ((v - range.min) / (range.max - range.min)) * (to - from);
  const px = logX ? (v: number) => scale({ min: Math.log10(xRange.min), max: Math.log10(xRange.max) }, plot.left, right)(Math.log10(v)) : scale(xRange, plot.left, right);
  const py = scale(yRange, bottom, plot.top);
  const path = (piece: BranchPiece) => piece.points.map((p, i) => `${i ? "L" : "M"}${px(p.x).toFixed(1)},${py(p.y).toFixed(1)}`).join("");
  const xTicks = logX ? logTicks(xRange) : linearTicks(xRange);
  const xTickLabels = logX ? logTickLabels(xTicks) : tickLabels(xTicks);
  const yTicks = linearTicks(yRange);

  return (
    <figure data-testid="bifurcation-diagram">
      <svg viewBox={`0 0 ${size.width} ${size.height}`} className="w-full max-w-3xl" role="img" aria-label={`Equilibrium ${species} against ${xLabel}`}>
        {xTicks.map((tick, i) => (
          <g key={`x${tick}`}>
            <line x1={px(tick)} x2={px(tick)} y1={plot.top} y2={bottom} stroke="var(--mw-line)" />
            <text x={px(tick)} y={bottom + 16} textAnchor="middle" fontSize="11" fill="var(--mw-muted)">{xTickLabels[i]}</text>
          </g>
        ))}
        {yTicks.map((tick, i) => (
          <g key={`y${tick}`}>
            <line x1={plot.left} x2={right} y1={py(tick)} y2={py(tick)} stroke="var(--mw-line)" />
            <text x={plot.left - 6} y={py(tick) + 4} textAnchor="end" fontSize="11" fill="var(--mw-muted)">{tickLabels(yTicks)[i]}</text>
          </g>
        ))}
        <rect x={plot.left} y={plot.top} width={right - plot.left} height={bottom - plot.top} fill="none" stroke="var(--mw-muted)" />
        {pieces.map((piece, i) => (
          <path key={i} d={path(piece)} fill="none" stroke="var(--mw-accent)" strokeWidth="2" strokeDasharray={piece.stable ? undefined : "7 5"} data-stable={String(piece.stable)} />
        ))}
        {result.bifurcations.map((b, i) => {
          const [x, y] = [px(b.value), py(b.state[species])];
          return (
            <g key={i} data-testid="bifurcation-marker">
              {b.kind === "fold" ? (
                <rect x={x - 5} y={y - 5} width="10" height="10" fill="var(--mw-ink)" />
              ) : (
                <circle cx={x} cy={y} r="6" fill="var(--mw-signal)" stroke="var(--mw-raised)" strokeWidth="1.5" />
              )}
              <text x={x + 9} y={y - 8} fontSize="12" fontWeight="600" fill="var(--mw-ink)" stroke="var(--mw-raised)" strokeWidth="4" paintOrder="stroke">{labels[i]}</text>
            </g>
          );
        })}
        <text x={(plot.left + right) / 2} y={size.height - 6} textAnchor="middle" fontSize="12" fill="var(--mw-ink)">{xLabel}</text>
        <text x={14} y={(plot.top + bottom) / 2} textAnchor="middle" fontSize="12" fill="var(--mw-ink)" transform={`rotate(-90 14 ${(plot.top + bottom) / 2})`}>equilibrium {species}</text>
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-muted [&>span]:inline-flex [&>span]:items-center [&>span]:gap-1.5">
        <span><svg width="26" height="8" aria-hidden="true"><line x1="0" x2="26" y1="4" y2="4" stroke="var(--mw-accent)" strokeWidth="2" /></svg> stable</span>
        <span><svg width="26" height="8" aria-hidden="true"><line x1="0" x2="26" y1="4" y2="4" stroke="var(--mw-accent)" strokeWidth="2" strokeDasharray="7 5" /></svg> unstable</span>
        <span><svg width="10" height="10" aria-hidden="true"><rect width="10" height="10" fill="var(--mw-ink)" /></svg> fold</span>
        <span><svg width="12" height="12" aria-hidden="true"><circle cx="6" cy="6" r="5" fill="var(--mw-signal)" /></svg> Hopf point</span>
      </figcaption>
      {result.bifurcations.length > 0 && (
        <ul className="mt-2 space-y-0.5 text-sm" data-testid="bifurcation-list">
          {result.bifurcations.map((b, i) => (
            <li key={i}>
              <strong>{labels[i]}</strong> {b.kind === "fold" ? "fold" : "Hopf point"} at {xLabel} = <span className="font-mono">{readableNumberText(b.value, 6)}</span>
              , {species} = <span className="font-mono">{readableNumberText(b.state[species], 6)}</span>
              {b.kind === "fold"
                ? " — two equilibria meet and vanish here"
                : b.frequency !== undefined && ` — oscillations of period near ${readableNumberText((2 * Math.PI) / b.frequency, 4)} start or stop here`}
            </li>
          ))}
        </ul>
      )}
    </figure>
  );
}
