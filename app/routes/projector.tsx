// A clean, full-screen complex graph for a projector: it follows the edits live, and the zoom
// that fills the screen makes the labels large enough for the back of a lecture hall.
import { useMemo } from "react";
import { Link } from "react-router";
import { ComplexGraph } from "~/components/graph/complex-graph";
import { layoutMap } from "~/shared/room-document";
import { requireViewAccess } from "~/utils/permissions.server";
import { useRoom } from "~/utils/use-room";
import type { Route } from "./+types/projector";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.title ?? "Mechanism"} · projector · Mechweave` }];

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, user } = await requireViewAccess(args, args.params.id);
  return { id: mechanism.id, title: mechanism.title, viewer: user?.name ?? "Projector" };
}

export default function Projector({ loaderData }: Route.ComponentProps) {
  const { id, title, viewer } = loaderData;
  // The projector only ever watches, whatever its user's role.
  const room = useRoom(id, { user: { name: `${viewer} (projector)` }, readOnly: true, role: "viewer" });
  const layout = useMemo(() => (room.doc ? layoutMap(room.doc) : null), [room.doc]);
  const analysis = room.analysis;
  return (
    <div className="fixed inset-0 z-50 flex flex-col bg-canvas">
      <header className="flex items-baseline gap-6 px-8 py-4">
        <h1 className="text-3xl">{title}</h1>
        {analysis.report && (
          <p className="text-xl text-muted" data-testid="projector-summary">
            {analysis.report.complexes.length} complexes · {analysis.linkageClasses} linkage classes · deficiency{" "}
            <strong className="text-ink">{analysis.deficiency}</strong>
          </p>
        )}
        {analysis.failure && <p className="text-xl text-danger" data-testid="analysis-failure">{analysis.failure}</p>}
        <Link to={`/m/${id}`} className="ml-auto text-sm">Leave projector view</Link>
      </header>
      <ComplexGraph report={analysis.report ?? null} layout={layout} canEdit={false} synced={room.synced} awareness={room.awareness} fitMaxZoom={3} className="min-h-0 flex-1" />
    </div>
  );
}
