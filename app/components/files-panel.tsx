import { Form, useNavigation } from "react-router";
import { atLeast, type Role } from "~/shared/roles";

interface FilesPanelProps {
  mechanismId: string;
  title: string;
  role: Role;
  actionData?: { ok?: string; error?: string };
}

const exports = [
  ["sbml", "SBML Level 3", "For other modelling software (an open standard)."],
  ["latex", "LaTeX", "The steps with rate coefficients over the arrows, and the ODE system."],
  ["csv", "Stoichiometric matrix (CSV)", "Species rows, reaction columns."],
] as const;

/** Downloads for everyone who can see the mechanism; renaming and deleting for those who may. */
export function FilesPanel({ mechanismId, title, role, actionData }: FilesPanelProps) {
  const busy = useNavigation().state === "submitting";
  return (
    <div className="space-y-4">
      <section className="card p-5">
        <h3>Download</h3>
        <ul className="mt-3 divide-y divide-line">
          {exports.map(([format, label, note]) => (
            <li key={format} className="flex items-center justify-between gap-4 py-2.5">
              <div>
                <div className="text-sm font-medium">{label}</div>
                <div className="text-xs text-muted">{note}</div>
              </div>
              <a className="btn" href={`/api/v1/mechanisms/${mechanismId}/export?format=${format}`} download>Download</a>
            </li>
          ))}
        </ul>
        <p className="mt-3 text-xs text-muted">The graph itself downloads as SVG or PNG from the graph's own toolbar.</p>
      </section>

      {atLeast(role, "editor") && (
        <Form method="post" className="card space-y-2 p-5">
          <h3>Title</h3>
          <input type="hidden" name="intent" value="rename" />
          <div className="flex gap-2">
            <input className="field" name="title" defaultValue={title} aria-label="Title" required maxLength={200} />
            <button className="btn" type="submit" disabled={busy}>Rename</button>
          </div>
          {actionData?.error && <p className="text-xs text-danger">{actionData.error}</p>}
          {actionData?.ok && <p className="text-xs text-ok">{actionData.ok}</p>}
        </Form>
      )}

      {role === "owner" && (
        <Form
          method="post"
          className="card flex items-center justify-between gap-4 p-5"
          onSubmit={(e) => {
            if (!confirm(`Delete “${title}” for every member? This cannot be undone.`)) e.preventDefault();
          }}
        >
          <div>
            <h3>Delete</h3>
            <p className="mt-1 text-xs text-muted">Removes the mechanism, its versions and its links for every member.</p>
          </div>
          <input type="hidden" name="intent" value="delete" />
          <button className="btn btn-danger" type="submit">Delete mechanism</button>
        </Form>
      )}
    </div>
  );
}
