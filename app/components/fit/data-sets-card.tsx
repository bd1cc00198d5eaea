// The mechanism's stored data sets: everyone sees them; editors upload CSV files and delete them.
import { useState } from "react";
import { byteSize, MAX_CSV_BYTES } from "~/chem/limits";
import { TimeAgo } from "~/components/time-ago";
import type { DataSetEntry } from "./use-fits";

interface Props {
  mechanismId: string;
  dataSets: DataSetEntry[];
  canEdit: boolean;
  chosen: Set<string>;
  onChoose(id: string, on: boolean): void;
  onChanged(): void;
}

export function DataSetsCard({ mechanismId, dataSets, canEdit, chosen, onChoose, onChanged }: Props) {
  const [note, setNote] = useState<string | null>(null);
  const base = `/api/v1/mechanisms/${mechanismId}/data-sets`;

  async function upload(files: FileList) {
    const notes: string[] = [];
    for (const file of Array.from(files)) {
      if (file.size > MAX_CSV_BYTES) {
        notes.push(`${file.name}: larger than ${byteSize(MAX_CSV_BYTES)}.`);
        continue;
      }
      const name = file.name.replace(/\.csv$/i, "");
      const response = await fetch(`${base}?name=${encodeURIComponent(name)}`, { method: "POST", headers: { "Content-Type": "text/csv" }, body: await file.text() });
      const body = (await response.json().catch(() => null)) as { error?: string; warnings?: string[] } | null;
      notes.push(response.ok ? `${name}: stored${body?.warnings?.length ? ` (${body.warnings.join("; ")})` : ""}.` : `${name}: ${body?.error ?? `the server answered ${response.status}`}`);
    }
    setNote(notes.join(" "));
    onChanged();
  }

  async function remove(entry: DataSetEntry) {
    const response = await fetch(`${base}/${entry.id}`, { method: "DELETE" });
    setNote(response.ok ? `${entry.name} deleted.` : `${entry.name} could not be deleted (${response.status}).`);
    onChanged();
  }

  return (
    <section className="card p-4" data-testid="data-sets">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h3>Data sets</h3>
        {canEdit && (
          <label className="btn">
            Upload CSV…
            <input type="file" accept=".csv,text/csv" multiple className="sr-only" data-testid="data-set-upload" onChange={(e) => e.target.files?.length && void upload(e.target.files)} />
          </label>
        )}
      </div>
      <p className="mt-1 text-xs text-muted">
        One experiment a file: a <code>time</code> column and one column per species; optional <code>sd(X)</code> columns give standard deviations,
        and comment lines such as <code># [A]0 = 0.002</code> or <code># T = 350</code> set what the experiment started from.
      </p>
      {dataSets.length === 0 ? (
        <p className="mt-3 text-sm text-muted">No data sets yet.</p>
      ) : (
        <ul className="mt-3 divide-y divide-line text-sm">
          {dataSets.map((entry) => (
            <li key={entry.id} className="flex items-center gap-3 py-1.5">
              <label className="flex min-w-0 flex-1 items-center gap-2">
                <input type="checkbox" checked={chosen.has(entry.id)} onChange={(e) => onChoose(entry.id, e.target.checked)} disabled={!canEdit} />
                <span className="truncate font-medium">{entry.name}</span>
              </label>
              <span className="text-xs text-muted">
                {(entry.bytes / 1024).toFixed(1)} KiB · {entry.uploadedBy ?? "someone"} · <TimeAgo at={entry.createdAt} />
              </span>
              <a className="text-xs" href={`${base}/${entry.id}`} download={`${entry.name}.csv`}>CSV</a>
              {canEdit && (
                <button type="button" className="text-xs text-danger" onClick={() => void remove(entry)}>Delete</button>
              )}
            </li>
          ))}
        </ul>
      )}
      {note && <p className="mt-2 text-xs text-muted" role="status">{note}</p>}
    </section>
  );
}
