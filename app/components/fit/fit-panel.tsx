// The Fit panel of the mechanism page: the group's data sets, fitting the text's parameters to
// them on the server, every fit anyone ran (appearing live), one fit's results, and the
// sensitivities and rates of production that tell which parameters the data can pin down.
import { useMemo, useState } from "react";
import type * as Y from "yjs";
import type { RoomReport } from "~/shared/analysis-map";
import { parseMechanism } from "~/chem/parse";
import { TimeAgo } from "~/components/time-ago";
import { DataSetsCard } from "./data-sets-card";
import { FitForm } from "./fit-form";
import { FitResultView } from "./fit-result";
import { SensitivityCard } from "./sensitivity-card";
import { useFits, type DataSetEntry } from "./use-fits";

interface Props {
  mechanismId: string;
  source: Y.Text | null;
  doc: Y.Doc | null;
  /** Changes with every analysis, so the parameter list follows the text. */
  report: RoomReport | null;
  canEdit: boolean;
}

export function FitPanel({ mechanismId, source, doc, report, canEdit }: Props) {
  const { dataSets, fits, error, reload } = useFits(mechanismId, doc);
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [shownFit, setShownFit] = useState<string | null>(null);
  const candidates = useMemo(() => {
    const { mechanism } = parseMechanism(source?.toString() ?? "");
    return [...Object.keys(mechanism.parameters), ...mechanism.species.map((species) => `[${species}]0`)];
    // The report changes when the text does; the Y.Text object itself does not.
  }, [source, report]);
  const choose = (id: string, on: boolean) =>
    setChosen((current) => {
      const next = new Set(current);
      if (on) next.add(id);
      else next.delete(id);
      return next;
    });
  const fit = fits.find((each) => each.id === shownFit) ?? fits[0];

  return (
    <div className="space-y-4" data-testid="fit-panel">
      <p className="rounded-md border border-signal bg-signal-soft px-3 py-2 text-xs text-signal" role="note">
        Fitted values and simulated dynamics model the chemistry as written. They do not replace experimental hazard assessment, local rules or licensed practice.
      </p>
      {error && <p className="notice-error">{error}</p>}
      <div className="grid gap-4 lg:grid-cols-2">
        <DataSetsCard mechanismId={mechanismId} dataSets={dataSets} canEdit={canEdit} chosen={chosen} onChoose={choose} onChanged={() => void reload()} />
        {canEdit ? (
          <FitForm mechanismId={mechanismId} candidates={candidates} chosenDataSets={inUploadOrder(dataSets.filter((d) => chosen.has(d.id)))} onFinished={() => void reload()} />
        ) : (
          <section className="card p-4 text-sm text-muted">Editors run fits; you see every fit here as it finishes.</section>
        )}
      </div>
      {fits.length > 0 && (
        <section className="card p-4" data-testid="fit-list">
          <h3>Fits</h3>
          <ul className="mt-2 divide-y divide-line text-sm">
            {fits.map((each) => (
              <li key={each.id}>
                <button type="button" className={`flex w-full items-center gap-3 py-1.5 text-left ${each.id === fit?.id ? "font-medium text-ink" : "text-muted"}`} onClick={() => setShownFit(each.id)}>
                  <span className="flex-1 truncate">{each.settings.vary.join(", ")} to {each.settings.dataSets.map((d) => d.name).join(", ")}</span>
                  <span className="text-xs">{each.status === "done" ? `cost ${each.result?.cost.toPrecision(3)}` : each.status}</span>
                  <span className="text-xs">{each.ranBy ?? "someone"} · <TimeAgo at={each.createdAt} /></span>
                </button>
              </li>
            ))}
          </ul>
        </section>
      )}
      {fit && <FitResultView key={fit.id} mechanismId={mechanismId} fit={fit} canEdit={canEdit} source={source} />}
      <SensitivityCard mechanismId={mechanismId} source={() => source?.toString() ?? ""} />
    </div>
  );
}

/** Chosen data sets oldest first, so a fit (and the version it names) lists them as they were uploaded. */
function inUploadOrder(dataSets: DataSetEntry[]): string[] {
  return [...dataSets].sort((a, b) => a.createdAt.localeCompare(b.createdAt)).map((d) => d.id);
}
