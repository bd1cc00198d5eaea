// The demo workspace: an invented laboratory (Tarnwick Flow Chemistry Group) with invented
// mechanisms and accounts under the reserved example.test domain. Never real people or data.
import { count } from "drizzle-orm";
import { createUser } from "../auth/authenticator";
import type { Db } from "../db/client";
import { addMember, createMechanism } from "../db/mechanisms";
import { users } from "../db/schema";
import { methaneOxidation } from "./methane-oxidation";

export const DEMO_PASSWORD = "weave-demo-2026";
export const demoAccounts = [
  { email: "owner@example.test", name: "Ines Okafor-Lund", role: "owner" },
  { email: "editor@example.test", name: "Tomas Greiner", role: "editor" },
  { email: "viewer@example.test", name: "Priya Vanterpool", role: "viewer" },
] as const;

export const demoMechanisms = [
  {
    title: "Autocatalytic dye bleaching",
    summary: "A product that speeds its own formation, with slow decay of the catalyst.",
    source: `# Bleaching of a dye D by oxidant O; the radical R catalyses its own formation.
init: D + O -> R @ k_init = 0.002
auto: D + O + R -> 2R @ k_auto = 0.8
decay: R -> 0 @ 0.05

[D]0 = 1.0
[O]0 = 1.2
`,
  },
  {
    title: "Two-enzyme relay",
    summary: "Substrate channelled through two enzymes; each binding step is reversible.",
    source: `# Enzyme E1 makes the intermediate I, which enzyme E2 turns into product P.
bind1: E1 + S <=> E1S @ 5.0, 0.4
cat1:  E1S -> E1 + I @ 1.2
bind2: E2 + I <=> E2I @ 3.0, 0.2
cat2:  E2I -> E2 + P @ 0.9

[E1]0 = 0.1
[E2]0 = 0.05
[S]0 = 2.0
`,
  },
  {
    title: "Oscillating feed candidate",
    summary: "A fed two-species scheme under study as a clock reaction for a flow cell.",
    source: `# Feed species A and B are held constant by the flow cell.
fixed [A] = 1.0
fixed [B] = 3.0

feed:   A -> U @ 1
cubic:  2U + V -> 3U @ 1
convert: B + U -> V @ 1
drain:  U -> 0 @ 1

[U]0 = 1.0
[V]0 = 1.0
`,
  },
  {
    title: "Isomer triangle",
    summary: "Three interconverting isomers; a reversible, deficiency-zero test case.",
    source: `# Every isomerisation runs both ways.
ab: Ia <=> Ib @ 2.0, 1.0
bc: Ib <=> Ic @ 1.5, 0.5
ca: Ic <=> Ia @ 0.25, 1.5

[Ia]0 = 1.0
`,
  },
  {
    title: "Dimerisation with inhibitor",
    summary: "Monomer dimerises; an inhibitor caps monomers reversibly.",
    source: `dimerise: 2M <=> M2 @ kf = 0.6, kb = 0.05
cap: M + Q <=> MQ @ 1.1, 0.3

[M]0 = 2.0
[Q]0 = 0.4
`,
  },
  methaneOxidation,
];

/** Fills an empty database with the demo workspace; does nothing if any account exists. */
export async function seedDemoIfEmpty(db: Db): Promise<boolean> {
  const [{ n }] = await db.select({ n: count() }).from(users);
  if (n > 0) return false;
  const created = [];
  for (const account of demoAccounts) {
    created.push(await createUser(db, { email: account.email, name: account.name, password: DEMO_PASSWORD }, { verified: true }));
  }
  for (const mechanism of demoMechanisms) {
    const row = await createMechanism(db, created[0].id, mechanism);
    await addMember(db, created[0].id, row.id, created[1].email, "editor");
    await addMember(db, created[0].id, row.id, created[2].email, "viewer");
  }
  return true;
}
