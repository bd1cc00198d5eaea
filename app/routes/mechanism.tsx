import { startTransition, useDeferredValue, useMemo, useRef, useState } from "react";
import type * as Y from "yjs";
import type { RoomReport } from "~/shared/analysis-map";
import type { XY } from "~/components/graph/layout";
import { Form, Link, redirect, useNavigation } from "react-router";
import { deleteMechanism, renameMechanism } from "~/utils/mechanisms.server";
import { atLeast } from "~/shared/roles";
import { layoutMap, sourceText } from "~/shared/room-document";
import { CollabEditor, type CollabEditorHandle } from "~/components/editor/collab-editor";
import { type CaretStep, ComplexGraph } from "~/components/graph/complex-graph";
import { Presence } from "~/components/presence";
import { RolePill } from "~/components/role-pill";
import { StructurePanel } from "~/components/structure-panel";
import { DynamicsTab } from "~/components/dynamics-tab";
import { FilesPanel } from "~/components/files-panel";
import { FitPanel } from "~/components/fit/fit-panel";
import { titleField } from "~/shared/fields";
import { httpError } from "~/utils/http";
import { requireRole, requireViewAccess } from "~/utils/permissions.server";
import { stepRangesFor } from "~/utils/step-ranges";
import { complexGraphSvg, currentThemeColours } from "~/utils/graph-svg";
import { PictureDownloads } from "~/components/picture-downloads";
import { useRoom, useRoomEquations } from "~/utils/use-room";
import type { Route } from "./+types/mechanism";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.mechanism.title ?? "Mechanism"} · Mechweave` }];

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, role, user } = await requireViewAccess(args, args.params.id);
  return {
    role,
    user: user ? { name: user.name } : { name: "Guest viewer" },
    signedIn: Boolean(user),
    mechanism: { id: mechanism.id, title: mechanism.title, summary: mechanism.summary, source: mechanism.source },
  };
}

export async function action(args: Route.ActionArgs) {
  const form = await args.request.formData();
  const intent = form.get("intent");
  if (intent === "rename") {
    const { mechanism } = await requireRole(args, args.params.id, "editor");
    const title = titleField.safeParse(form.get("title"));
    if (!title.success) return httpError("bad_input", title.error.issues[0].message);
    await renameMechanism(args.context.db, mechanism.id, title.data);
    return { ok: "Renamed." };
  }
  if (intent === "delete") {
    const { mechanism, user } = await requireRole(args, args.params.id, "owner");
    await deleteMechanism(args.context.db, user.id, mechanism.id);
    throw redirect("/dashboard");
  }
  throw httpError("bad_input", "Unknown action.");
}

const allTabs = ["Graph", "Structure", "Dynamics", "Fit", "Files & settings"] as const;
type Tab = (typeof allTabs)[number];

export default function MechanismPage({ loaderData, actionData }: Route.ComponentProps) {
  const { mechanism, role, user, signedIn } = loaderData;
  const canEdit = atLeast(role, "editor");
  const room = useRoom(mechanism.id, { user, readOnly: !canEdit, role });
  const editor = useRef<CollabEditorHandle>(null);
  const [tab, setTab] = useState<Tab>("Graph");
  const [caretStep, setCaretStep] = useState<CaretStep | null>(null);
  // The graph lights the caret's step at low priority: at 500 steps that redraw would otherwise run
  // inside the keystroke that moved the caret, before its letter is painted.
  const followCaret = (step: CaretStep | null) => startTransition(() => setCaretStep(step));
  const source = useMemo(() => (room.doc ? sourceText(room.doc) : null), [room.doc]);
  const layout = useMemo(() => (room.doc ? layoutMap(room.doc) : null), [room.doc]);
  const report = room.analysis.report ?? null;
  // The panels follow the analysis at low priority: React renders them in slices between
  // keystrokes instead of in one block that would hold up the editor at every new report.
  const shownReport = useDeferredValue(report);
  const equations = useDeferredValue(useRoomEquations(room.doc, tab === "Structure"));
  // A view-link guest sees the live mechanism and nothing else: no files, no settings, no fits.
  // Data sets and fits are read over the API, which a view link does not open.
  const tabs = signedIn ? allTabs : allTabs.filter((name) => name !== "Files & settings" && name !== "Fit");

  return (
    <main className="mx-auto max-w-[96rem] px-6 py-5">
      <header className="flex flex-wrap items-center justify-between gap-4">
        <div className="min-w-0">
          <p className="text-xs text-muted">
            {signedIn ? <Link to="/dashboard">Mechanisms</Link> : "Shared view"} / <span className="font-mono">{mechanism.id}</span>
          </p>
          <h1 className="mt-0.5 truncate" data-testid="mechanism-title">{mechanism.title}</h1>
          {mechanism.summary && <p className="max-w-3xl truncate text-sm text-muted" title={mechanism.summary}>{mechanism.summary}</p>}
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <RoomStatusBadge status={room.status} revision={room.analysis.revision} />
          <Presence self={room.self} peers={room.peers} />
          <RolePill role={role} />
          {signedIn && (
            <nav className="flex gap-2">
              <Link to={`/m/${mechanism.id}/history`} className="btn">History</Link>
              <Link to={`/m/${mechanism.id}/members`} className="btn">Members</Link>
              <Link to={`/m/${mechanism.id}/projector`} className="btn" title="A full-screen graph for a projector">Projector</Link>
            </nav>
          )}
        </div>
      </header>

      <section className="mt-4 grid gap-4 xl:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
        {/* A bounded card: a long text scrolls inside the editor instead of stretching the row, which
            would centre the graph beside it far below the fold. */}
        <div className="card flex h-[calc(100vh-9rem)] min-h-[32rem] flex-col overflow-hidden">
          <div className="flex items-center justify-between border-b border-line px-4 py-2 text-xs text-muted">
            <span>Mechanism text{canEdit ? "" : " · read-only"}</span>
            <Summary errors={room.analysis.errors} deficiency={room.analysis.deficiency} failed={Boolean(room.analysis.failure)} />
          </div>
          {/* Before the room connects, the saved text stands in so the page is never blank. */}
          {source ? (
            <CollabEditor ref={editor} source={source} awareness={room.awareness} readOnly={!canEdit} notice={room.notice} onCaretStep={followCaret} className="min-h-0 flex-1" />
          ) : (
            <pre className="flex-1 overflow-auto p-4 text-sm leading-relaxed text-muted" data-testid="source">{mechanism.source}</pre>
          )}
        </div>

        <div className="flex min-w-0 flex-col gap-3">
          <div role="tablist" className="flex gap-1 border-b border-line">
            {tabs.map((name) => (
              <button
                key={name}
                role="tab"
                aria-selected={tab === name}
                onClick={() => setTab(name)}
                className={`-mb-px border-b-2 px-3 py-2 text-sm font-medium ${tab === name ? "border-accent text-ink" : "border-transparent text-muted hover:text-ink"}`}
              >
                {name}
              </button>
            ))}
          </div>
          {room.analysis.failure && <AnalysisFailure message={room.analysis.failure} stale={Boolean(report)} />}
          {tab === "Graph" && shownReport && layout && <GraphDownloads report={shownReport} layout={layout} title={mechanism.title} />}
          {tab === "Graph" && (
            <ComplexGraph
              report={shownReport}
              layout={layout}
              canEdit={canEdit}
              synced={room.synced}
              awareness={room.awareness}
              caretStep={caretStep}
              className="h-[36rem]"
              onSelect={(selection) => editor.current?.highlight(source ? stepRangesFor(source.toString(), selection) : [])}
            />
          )}
          {tab === "Structure" && (shownReport ? <StructurePanel report={shownReport} equations={equations} witnessJob={{ mechanismId: mechanism.id, source: () => source?.toString() ?? mechanism.source }} /> : !room.analysis.failure && <Waiting />)}
          {tab === "Dynamics" && <DynamicsTab mechanismId={mechanism.id} source={source} report={report} />}
          {tab === "Fit" && <FitPanel mechanismId={mechanism.id} source={source} doc={room.doc} report={report} canEdit={canEdit} />}
          {tab === "Files & settings" && (
            <FilesPanel mechanismId={mechanism.id} title={mechanism.title} role={role} actionData={actionData as { ok?: string; error?: string } | undefined} />
          )}
        </div>
      </section>
    </main>
  );
}

function GraphDownloads({ report, layout, title }: { report: RoomReport; layout: Y.Map<unknown>; title: string }) {
  const svg = () => complexGraphSvg(report, layout.toJSON() as Record<string, XY>, currentThemeColours());
  const name = title.replace(/[^\w.-]+/g, "-") || "complex-graph";
  return (
    <div className="-mb-1 flex justify-end gap-2 text-xs">
      <PictureDownloads svg={svg} name={name} />
    </div>
  );
}

function Waiting() {
  return <p className="card p-6 text-sm text-muted">Waiting for the server's analysis…</p>;
}

/** The server gave up on this text (over the time limit, say); what is shown, if anything, is from an earlier text. */
function AnalysisFailure({ message, stale }: { message: string; stale: boolean }) {
  return (
    <p className="notice-error" role="status" data-testid="analysis-failure">
      {message}
      {stale && " The analysis shown is of an earlier version of the text."}
    </p>
  );
}

function Summary({ errors, deficiency, failed }: { errors?: number; deficiency?: number; failed: boolean }) {
  if (failed) return <span className="text-danger" data-testid="live-summary">no analysis</span>;
  if (errors === undefined) return null;
  return (
    <span data-testid="live-summary">
      {errors > 0 ? <span className="text-danger">{errors} error{errors === 1 ? "" : "s"}</span> : <span className="text-ok">no errors</span>}
      {deficiency !== undefined && <> · deficiency <strong className="text-ink">{deficiency}</strong></>}
    </span>
  );
}

function RoomStatusBadge({ status, revision }: { status: string; revision?: number }) {
  const tone = status === "online" ? "bg-ok" : status === "offline" ? "bg-danger" : "bg-signal";
  return (
    <span className="flex items-center gap-1.5 text-xs text-muted" data-testid="room-status" data-status={status} title={revision ? `analysis revision ${revision}` : undefined}>
      <span className={`inline-block h-2 w-2 rounded-full ${tone}`} aria-hidden="true" />
      {status === "online" ? "live" : status}
    </span>
  );
}
