// stepper.ts's errorNorm: root-mean-square of e/(atol + rtol·max(|y|, |ŷ|)).

export let rtol: f64 = 1e-6;
export let atol: f64 = 1e-10;

export function setTolerances(relative: f64, absolute: f64): void {
  rtol = relative;
  atol = absolute;
}

export function errorNorm(error: StaticArray<f64>, y: StaticArray<f64>, yNew: StaticArray<f64>): f64 {
  const length = error.length;
  let sum: f64 = 0;
  for (let i = 0; i < length; i++) {
    const scale = atol + rtol * Math.max(Math.abs(unchecked(y[i])), Math.abs(unchecked(yNew[i])));
    const ratio = unchecked(error[i]) / scale;
    sum += ratio * ratio;
  }
  const norm = Math.sqrt(sum / <f64>max(1, length));
  return isNaN(norm) ? Infinity : norm;
}
