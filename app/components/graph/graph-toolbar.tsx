// The strip over the graph: which view (complexes, or species and steps), a search box that finds a
// species or a step and focuses it, folding of linkage classes, and in the species–step view how
// hub species are drawn and whether a focus stands alone.
import { useId, useMemo, useState } from "react";
import { findEntries, type FocusTarget, type SearchEntry } from "./graph-focus";
import type { HubDrawing } from "./species-step-model";
import type { SpeciesViewChoice } from "./species-view-choice";

export type GraphView = "complexes" | "species";

export interface GraphToolbarProps {
  view: GraphView;
  onView(view: GraphView): void;
  entries: readonly SearchEntry[];
  focus: SearchEntry | null;
  onFocus(target: FocusTarget | null): void;
  /** Present in the complex view: how many classes are folded, of how many. */
  folding?: { folded: number; classes: number; foldAll(): void; unfoldAll(): void };
  /** Present in the species–step view: the hub species (most used first) and the reader's choice. */
  speciesView?: { hubs: string[]; choice: SpeciesViewChoice; onChoice(change: Partial<SpeciesViewChoice>): void };
}

const hubDrawings: [HubDrawing, string][] = [
  ["copies", "a copy beside each step"],
  ["hidden", "left out"],
  ["once", "drawn once"],
];
/** Hub names listed in the strip; the rest are counted. */
const listedHubs = 6;

const views: [GraphView, string][] = [
  ["complexes", "Complexes"],
  ["species", "Species & steps"],
];

export function GraphToolbar({ view, onView, entries, focus, onFocus, folding, speciesView }: GraphToolbarProps) {
  const [query, setQuery] = useState("");
  const [open, setOpen] = useState(false);
  const matches = useMemo(() => findEntries(entries, query), [entries, query]);
  const listId = useId();
  const choose = (entry: SearchEntry) => {
    onFocus(entry);
    setQuery(entry.name);
    setOpen(false);
  };
  return (
    <div className="flex flex-wrap items-center gap-2 border-b border-line bg-surface px-2 py-1.5 text-xs" data-testid="graph-toolbar">
      <div role="radiogroup" aria-label="Graph view" className="flex overflow-hidden rounded border border-line">
        {views.map(([name, label]) => (
          <button
            key={name}
            type="button"
            role="radio"
            aria-checked={view === name}
            onClick={() => onView(name)}
            className={`px-2 py-1 ${view === name ? "bg-accent text-accent-ink" : "text-muted hover:text-ink"}`}
          >
            {label}
          </button>
        ))}
      </div>
      <div className="relative">
        <input
          type="search"
          value={query}
          placeholder="Find a species or step"
          aria-label="Find a species or step"
          aria-controls={listId}
          aria-expanded={open && matches.length > 0}
          role="combobox"
          className="w-48 rounded border border-line bg-raised px-2 py-1 font-mono text-ink"
          data-testid="graph-search"
          onChange={(event) => {
            setQuery(event.target.value);
            setOpen(true);
            if (!event.target.value) onFocus(null);
          }}
          onFocus={() => setOpen(true)}
          onBlur={() => setOpen(false)}
          onKeyDown={(event) => {
            if (event.key === "Enter" && matches[0]) choose(matches[0]);
            if (event.key === "Escape") setOpen(false);
          }}
        />
        {open && matches.length > 0 && (
          <ul id={listId} role="listbox" className="absolute top-full left-0 z-20 mt-1 max-h-64 w-56 overflow-auto rounded border border-line bg-raised py-1 shadow">
            {matches.map((entry) => (
              <li
                key={`${entry.kind}${entry.index}`}
                role="option"
                aria-selected={false}
                // Chosen on mouse down, before the input's blur closes the list.
                onMouseDown={(event) => {
                  event.preventDefault();
                  choose(entry);
                }}
                className="flex cursor-pointer justify-between gap-3 px-2 py-0.5 hover:bg-accent-soft"
              >
                <span className="font-mono text-ink">{entry.name}</span>
                <span className="text-muted">{entry.kind === "species" ? "species" : "step"}</span>
              </li>
            ))}
          </ul>
        )}
      </div>
      {focus && (
        <button
          type="button"
          className="btn"
          onClick={() => {
            onFocus(null);
            setQuery("");
          }}
          data-testid="clear-focus"
        >
          Show all
        </button>
      )}
      {speciesView && <SpeciesViewControls {...speciesView} focused={focus !== null} />}
      {folding && folding.classes > 1 && (
        <span className="ml-auto flex items-center gap-2 text-muted" data-testid="folding">
          {folding.folded} of {folding.classes} classes folded
          <button type="button" className="btn" onClick={folding.unfoldAll} disabled={folding.folded === 0}>
            Unfold all
          </button>
          <button type="button" className="btn" onClick={folding.foldAll} disabled={folding.folded === folding.classes}>
            Fold all
          </button>
        </span>
      )}
    </div>
  );
}

function SpeciesViewControls({ hubs, choice, onChoice, focused }: NonNullable<GraphToolbarProps["speciesView"]> & { focused: boolean }) {
  const named = hubs.slice(0, listedHubs).join(", ") + (hubs.length > listedHubs ? ` and ${hubs.length - listedHubs} more` : "");
  return (
    <span className="ml-auto flex flex-wrap items-center gap-2 text-muted" data-testid="hub-controls">
      <label className="flex items-center gap-1" title="A species that this many steps or more use is a hub: it would pull all of them into one knot">
        Hubs, used by ≥
        <input
          type="number"
          min={2}
          step={1}
          value={choice.threshold}
          onChange={(event) => {
            const threshold = Math.round(Number(event.target.value));
            if (Number.isFinite(threshold) && threshold >= 2) onChoice({ threshold });
          }}
          className="w-12 rounded border border-line bg-raised px-1 py-0.5 text-ink"
          aria-label="Steps that make a species a hub"
        />
        steps:
      </label>
      <span className="max-w-64 truncate font-mono text-ink" data-testid="hub-names" title={hubs.join(", ")}>
        {hubs.length > 0 ? named : "none"}
      </span>
      <select
        value={choice.hubs}
        onChange={(event) => onChoice({ hubs: event.target.value as HubDrawing })}
        className="rounded border border-line bg-raised px-1 py-0.5 text-ink"
        aria-label="How hub species are drawn"
        disabled={hubs.length === 0}
      >
        {hubDrawings.map(([value, label]) => (
          <option key={value} value={value}>
            {label}
          </option>
        ))}
      </select>
      <label className="flex items-center gap-1" title="With a species or step found, show only its steps and their species, laid out on their own">
        <input type="checkbox" checked={choice.focusOnly} onChange={(event) => onChoice({ focusOnly: event.target.checked })} />
        Focus alone{choice.focusOnly && !focused ? " (find something)" : ""}
      </label>
    </span>
  );
}
