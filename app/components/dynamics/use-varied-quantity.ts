// The quantity a sweep or a continuation varies, and its range: the choices and their values are
// read off the text when the picker opens; a range the reader typed holds for the quantity it was
// typed for, and any other quantity starts a decade either side of its value (a temperature nearer).
import { useState } from "react";
import { defaultSweepRange, sweepTargets, targetValues } from "./targets";

export function useVariedQuantity(text: () => string, species: string[]) {
  const [target, setTarget] = useState("");
  const [targets, setTargets] = useState<string[]>(() => sweepTargets(text(), species));
  const [values, setValues] = useState(() => targetValues(text()));
  const [typedRange, setTypedRange] = useState<{ target: string; from: number; to: number } | null>(null);
  // A held species or a parameter is the usual thing to vary; an initial amount (a total) otherwise.
  const chosen = target || targets.find((t) => !t.startsWith("initial:")) || targets[0] || "";
  const { from, to } = typedRange?.target === chosen ? typedRange : defaultSweepRange(values.get(chosen), chosen);
  return {
    chosen,
    choose: setTarget,
    targets,
    /** Reads the choices and their values off the text again (the picker has opened). */
    reread: () => {
      setTargets(sweepTargets(text(), species));
      setValues(targetValues(text()));
    },
    from,
    to,
    setRange: (change: { from?: number; to?: number }) => setTypedRange({ target: chosen, from, to, ...change }),
  };
}
