// The contribution of each reaction to d[X]/dt at one time, ranked by size: bars to the right
// produce the species, bars to the left consume it. Computed in the page from the run's
// concentrations (app/chem/fit/rates-of-production.ts), so moving the time slider costs no request.
import { useMemo } from "react";
import { ratesOfProduction } from "~/chem/fit/rates-of-production";
import type { SensitivityResult } from "~/chem/fit/types";
import type { Mechanism, Network } from "~/chem/model";
import { readableNumberText } from "~/chem/numbers";
import { divergingColour } from "./colour-scale";

/** Bars shown; the rest are summed into one line, so a 60-step mechanism stays readable. */
const SHOWN = 12;

interface Props {
  /** The text the run used, parsed, and its network. */
  model: { mechanism: Mechanism; network: Network };
  result: SensitivityResult;
  species: string;
  index: number;
}

export function RatesOfProductionChart({ model, result, species, index }: Props) {
  const rates = useMemo(() => {
    try {
      return ratesOfProduction(model.mechanism, model.network, { t: result.t, series: result.series }, species, result.t[index]);
    } catch {
      return null;
    }
  }, [model, result, species, index]);
  if (!rates || rates.contributions.length === 0) return <p className="mt-2 text-sm text-muted">No reaction changes {species}.</p>;
  const shown = rates.contributions.slice(0, SHOWN);
  const rest = rates.contributions.slice(SHOWN).reduce((sum, each) => sum + each.contribution, 0);
  const largest = Math.max(...shown.map((each) => Math.abs(each.contribution)), 1e-300);
  return (
    <div className="mt-2" data-testid="rates-of-production">
      <ul className="space-y-0.5 text-xs">
        {shown.map((each) => {
          const share = Math.abs(each.contribution) / largest;
          const producing = each.contribution >= 0;
          return (
            <li key={each.reaction} className="grid grid-cols-[minmax(0,14rem)_1fr_1fr_6rem] items-center gap-2">
              <span className="truncate font-mono" title={`${each.steps.join(", ")}: ${each.reaction}`}>{each.steps.join(", ")} · {each.reaction}</span>
              <span className="flex justify-end">{!producing && <span className="h-3 rounded-l" style={{ width: `${share * 100}%`, background: divergingColour(-0.9) }} />}</span>
              <span className="flex">{producing && <span className="h-3 rounded-r" style={{ width: `${share * 100}%`, background: divergingColour(0.9) }} />}</span>
              <span className="text-right tabular-nums">{readableNumberText(each.contribution, 3)}</span>
            </li>
          );
        })}
      </ul>
      <p className="mt-1 text-xs text-muted">
        d[{species}]/dt = {readableNumberText(rates.total, 3)}
        {rates.contributions.length > SHOWN && ` · ${rates.contributions.length - SHOWN} smaller contributions sum to ${readableNumberText(rest, 3)}`}. Left: consumes, right: produces.
      </p>
    </div>
  );
}
