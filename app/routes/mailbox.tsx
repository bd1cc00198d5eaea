// The local mail catcher's inbox, for development: only when no SMTP_URL is set, and only for
// the demo workspace's owner account (the demo admin).
import { TimeAgo } from "~/components/time-ago";
import { requireCaughtMail } from "~/utils/mailbox.server";
import type { Route } from "./+types/mailbox";

export const meta: Route.MetaFunction = () => [{ title: "Mailbox · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  return { messages: await requireCaughtMail(args) };
}

export default function Mailbox({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <h1>Mailbox</h1>
      <p className="mt-1 text-sm text-muted">Everything this development server sent, caught locally. Nothing left the machine.</p>
      <div className="mt-6 space-y-3">
        {loaderData.messages.map((m, i) => (
          <article key={i} className="card p-4">
            <header className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 className="text-base">{m.subject}</h2>
              <span className="text-xs text-muted">to {m.to.join(", ")} · <TimeAgo at={m.at} /></span>
            </header>
            <pre className="mt-2 whitespace-pre-wrap text-sm text-muted">{m.text}</pre>
          </article>
        ))}
        {loaderData.messages.length === 0 && <p className="text-muted">No mail yet.</p>}
      </div>
    </main>
  );
}
