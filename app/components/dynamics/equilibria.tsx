// Every equilibrium an equilibrium search found in the compatibility class, each with its
// stability, state and eigenvalues. Presentational: it shows an EquilibriumResult.
import type { Eigenvalue, Equilibrium, EquilibriumResult } from "~/chem/kinetics/equilibrium";
import { readableNumberText } from "~/chem/numbers";

const startNames: Record<Equilibrium["foundFrom"], string> = {
  given: "from the given state",
  settled: "from the end of a settling run",
  initial: "from the initial state",
  random: "from a random start in the class",
};

export function EquilibriumList({ result }: { result: EquilibriumResult }) {
  const { equilibria } = result;
  return (
    <div className="mt-3 space-y-3 text-sm" data-testid="equilibrium">
      <p>{result.summary}</p>
      {equilibria.map((equilibrium, index) => (
        <div key={index} className="border-t border-line pt-2" data-testid="equilibrium-entry">
          <p className="font-medium">
            {equilibria.length > 1 ? `Equilibrium ${index + 1}: ` : ""}
            {equilibrium.stability ?? "stability unknown"}
            {equilibrium.positive ? "" : ", on the boundary"}
            <span className="font-normal text-muted"> — found {startNames[equilibrium.foundFrom]}</span>
          </p>
          {equilibria.length > 1 && <p className="text-xs text-muted">{equilibrium.summary}</p>}
          <table className="w-full text-xs">
            <tbody>
              {Object.entries(equilibrium.state).map(([name, value]) => (
                <tr key={name} className="border-t border-line"><td className="py-0.5 font-medium">{name}</td><td className="font-mono">{readableNumberText(value, 6)}</td></tr>
              ))}
            </tbody>
          </table>
          <p className="text-xs text-muted">Eigenvalues in the compatibility class: {equilibrium.eigenvalues.map(eigenvalueText).join(", ") || "none"}</p>
        </div>
      ))}
    </div>
  );
}

function eigenvalueText({ re, im }: Eigenvalue): string {
  return im ? `${readableNumberText(re, 3)} ± ${readableNumberText(Math.abs(im), 3)}i` : readableNumberText(re, 3);
}
