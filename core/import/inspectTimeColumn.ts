/**
 * Heuristics on the time column of the sniffed rows: whether a headerless first column is a time
 * base, and the interval the even-sampling checks compare against.
 */
/** Least-squares slope of values against index, ignoring NaN entries. */
function slopeOf(values: readonly number[]): number {
  let n = 0;
  let si = 0;
  let sii = 0;
  let sv = 0;
  let siv = 0;
  const v0 = values.find((v) => v === v) ?? 0;
  values.forEach((v, i) => {
    if (v !== v) return;
    const u = v - v0;
    n++;
    si += i;
    sii += i * i;
    sv += u;
    siv += i * u;
  });
  const sxx = sii - (si * si) / n;
  return n >= 2 && sxx > 0 ? (siv - (si * sv) / n) / sxx : NaN;
}

/**
 * Interval for the even-sampling checks: the median time step when stamps are printed finely
 * (robust to a gap or an outlier in the sniffed rows), else the least-squares slope (stamps
 * rounded to a step near or above the interval). Common practice, no source.
 */
export function referenceInterval(timesS: readonly number[], exps: readonly number[], factorS: number): number {
  const steps: number[] = [];
  for (let i = 1; i < timesS.length; i++) {
    const d = timesS[i] - timesS[i - 1];
    if (d === d) steps.push(d);
  }
  if (steps.length === 0) return NaN;
  steps.sort((x, y) => x - y);
  const median = steps[steps.length >> 1];
  let coarsest = -Infinity;
  for (let i = 0; i < exps.length; i++) if (timesS[i] === timesS[i] && exps[i] > coarsest) coarsest = exps[i];
  const resolutionS = Math.pow(10, coarsest) * factorS;
  return median > 20 * resolutionS ? median : slopeOf(timesS);
}

/**
 * Headerless files: the first column is a time base if it never decreases, rises overall and
 * stays within one printed resolution plus 0.3 steps of its least-squares line (cells that are
 * not numbers are skipped). Common practice, no source.
 */
export function looksLikeTime(values: readonly number[], exps: readonly number[]): boolean {
  const index: number[] = [];
  for (let i = 0; i < values.length; i++) if (values[i] === values[i]) index.push(i);
  const n = index.length;
  if (n < 3) return false;
  for (let k = 1; k < n; k++) if (values[index[k]] < values[index[k - 1]]) return false;
  if (!(values[index[n - 1]] > values[index[0]])) return false;
  const slope = slopeOf(values);
  if (!(slope > 0)) return false;
  let meanI = 0;
  let meanV = 0;
  for (const i of index) {
    meanI += i / n;
    meanV += (values[i] - values[index[0]]) / n;
  }
  for (const i of index) {
    const fitted = values[index[0]] + meanV + slope * (i - meanI);
    if (Math.abs(values[i] - fitted) > Math.pow(10, exps[i]) + 0.3 * slope) return false;
  }
  return true;
}
