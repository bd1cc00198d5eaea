// Sustained oscillation in a sampled time course, and its period. Only the second half of the run
// is read (the approach to a limit cycle is a transient), and an oscillation whose amplitude is
// still shrinking towards an equilibrium does not count.

/** Relative size of a swing below which the course is taken as flat. */
const FLAT = 1e-3;

export function oscillationPeriod(t: readonly number[], x: readonly number[]): number | null {
  const half = Math.floor(t.length / 2);
  const times = t.slice(half);
  const values = x.slice(half);
  if (values.length < 8) return null;
  const swing = (from: number, to: number) => {
    const part = values.slice(from, to);
    return Math.max(...part) - Math.min(...part);
  };
  const high = Math.max(...values);
  const low = Math.min(...values);
  if (high - low <= FLAT * Math.max(Math.abs(high), Math.abs(low))) return null;
  const quarter = Math.floor(values.length / 2);
  if (swing(quarter, values.length) < 0.5 * swing(0, quarter)) return null; // still damping out

  const middle = (high + low) / 2;
  const crossings: number[] = [];
  for (let i = 1; i < values.length; i++) {
    if (values[i - 1] < middle && values[i] >= middle) {
      const fraction = (middle - values[i - 1]) / (values[i] - values[i - 1]);
      crossings.push(times[i - 1] + fraction * (times[i] - times[i - 1]));
    }
  }
  if (crossings.length < 3) return null;
  return (crossings[crossings.length - 1] - crossings[0]) / (crossings.length - 1);
}
