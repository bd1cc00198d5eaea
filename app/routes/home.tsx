import { Link, redirect } from "react-router";
import { analyzeSource } from "~/chem/analysis";
import { Logo } from "~/components/logo";
import { getUser } from "~/utils/auth.server";
import type { Route } from "./+types/home";

export const meta: Route.MetaFunction = () => [
  { title: "Mechweave · reaction mechanisms, written together" },
  { name: "description", content: "A shared, versioned workspace for chemical reaction mechanisms and their network structure." },
];

const example = `# a fed two-species clock
fixed [A] = 1.0
feed:  A -> U @ 1
cubic: 2U + V -> 3U @ 1
drain: U -> 0 @ 1`;

export async function loader(args: Route.LoaderArgs) {
  if (await getUser(args)) throw redirect("/dashboard");
  // The example's figures come from the engine, so the front page never claims what it would not.
  const report = await analyzeSource(example);
  return { complexes: report.complexes.length, linkageClasses: report.linkageClasses.length, deficiency: report.deficiency };
}

const features = [
  ["Live co-editing", "Co-authors type into one mechanism; everyone sees each keystroke, cursor and the redrawn complex graph."],
  ["Structure on every change", "Linkage classes, rank, deficiency, conservation laws and what the deficiency theorems guarantee."],
  ["Versions you can trust", "Snapshots on every structural change, named versions, diffs in text and in invariants."],
  ["Dynamics and realizations", "Stiff mass-action simulation, and polynomial ODEs turned into mechanisms."],
];

export default function Home({ loaderData }: Route.ComponentProps) {
  const { complexes, linkageClasses, deficiency } = loaderData;
  return (
    <main className="mx-auto max-w-6xl px-6 py-16">
      <section className="grid items-center gap-12 md:grid-cols-2">
        <div>
          <Logo size={48} />
          <h1 className="mt-6 text-4xl leading-tight">Reaction mechanisms, written together, understood at once.</h1>
          <p className="mt-4 text-lg text-muted">
            Mechweave is a shared workspace for chemists, engineers and network theorists: write the steps, and the server tells
            everyone in the room what the network's structure implies under mass-action kinetics.
          </p>
          <div className="mt-8 flex gap-3">
            <Link to="/sign-up" className="btn btn-primary px-5 py-2.5">Create an account</Link>
            <Link to="/sign-in" className="btn px-5 py-2.5">Sign in</Link>
          </div>
        </div>
        <pre className="card overflow-x-auto p-6 text-sm leading-relaxed">
{`${example}\n\n${complexes} complexes · ${linkageClasses} linkage classes · deficiency ${deficiency}`}
        </pre>
      </section>
      <section className="mt-16 grid gap-4 md:grid-cols-4">
        {features.map(([title, text]) => (
          <div key={title} className="card p-5">
            <h2 className="text-base">{title}</h2>
            <p className="mt-2 text-sm text-muted">{text}</p>
          </div>
        ))}
      </section>
    </main>
  );
}
