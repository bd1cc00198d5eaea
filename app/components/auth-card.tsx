import { Logo } from "./logo";

export function AuthCard({ title, lead, children, footer }: { title: string; lead: string; children: React.ReactNode; footer: React.ReactNode }) {
  return (
    <main className="mx-auto grid max-w-5xl gap-10 px-6 py-16 md:grid-cols-[1fr_26rem]">
      <section className="hidden flex-col justify-center md:flex">
        <Logo size={44} />
        <p className="mt-6 max-w-sm text-2xl font-semibold leading-snug tracking-tight">
          Write the mechanism together. See what its structure guarantees before you fit a single rate.
        </p>
        <p className="mt-4 max-w-sm text-muted">
          Complex graph, deficiency, conservation laws and the deficiency theorems' verdicts, recomputed on every keystroke.
        </p>
      </section>
      <section className="card p-8">
        <h1>{title}</h1>
        <p className="mt-1 text-sm text-muted">{lead}</p>
        <div className="mt-6">{children}</div>
        <p className="mt-6 text-sm text-muted">{footer}</p>
      </section>
    </main>
  );
}
