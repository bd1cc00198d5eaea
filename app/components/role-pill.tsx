import type { Role } from "~/shared/roles";

const tone: Record<Role, string> = {
  owner: "bg-accent-soft text-accent",
  editor: "bg-signal-soft text-signal",
  viewer: "bg-canvas text-muted border border-line",
};

export function RolePill({ role }: { role: Role }) {
  return <span className={`pill ${tone[role]}`}>{role}</span>;
}
