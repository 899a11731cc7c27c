import type { LineFindingCollector } from './collectLineFindings.js';
import { powerOfTen } from './composeDecimal.js';

/**
 * Running estimate of the sample interval from a time column, without storing the column.
 *
 * The interval is the least-squares slope of time against sample index over the whole record
 * (ordinary least squares, e.g. Press et al., Numerical Recipes 3rd ed. §15.2); sums are taken
 * of t - t_first so that a large start time does not cost precision. One printed time stamp is
 * never used on its own: exports round time stamps (often to 4-6 significant digits), so
 * neighbouring stamps may differ by 0 or by several intervals.
 *
 * Each stamp is compared with a running prediction: the previous prediction plus one reference
 * interval per row, pulled 1/16 of the way towards each stamp. The pull keeps the prediction on
 * the mean of rounded stamps, so a rounded but even time base stays within one printed
 * resolution of it. Checks, each reported as `uneven-sampling` with the 1-based line:
 * - backwards: a stamp earlier than the previous one;
 * - gap: a stamp more than 1.5 intervals plus the printed resolution ahead of the prediction
 *   (a step of about 2x or more: samples missing); the prediction restarts there;
 * - jitter: a stamp further than the printed resolution plus 0.3 interval from the prediction.
 * Common practice, no source.
 */
/** Rows kept at the start of the record to choose the two anchors of the interval bounds. */
const ANCHOR_WINDOW = 2048;
/** Rows addRun takes through its fast loop before writing its state back (see addRun). */
const RUN_BLOCK_ROWS = 4096;

export class TimebaseTracker {
  private n = 0;
  // Initialised as -0, a value that is never a small integer, so that each field holds a double
  // from the start: a field that begins as a small integer changes representation once a sum
  // outgrows it, which deoptimises the parse loop the tracker is inlined into (-0 + x is x).
  private sumI = -0;
  private sumII = -0;
  private sumU = -0;
  private sumIU = -0;
  private first = NaN;
  private prev = NaN;
  private prediction = NaN;
  private lastRow = -1;
  // Interval bounds from printed resolution (see fit()): anchors chosen in the first rows.
  private readonly window = new Float64Array(3 * ANCHOR_WINDOW);
  private windowCount = 0;
  // No anchor yet while negative. Initialised as a non-integer, so that the field holds a double
  // from the start: the anchors' rows come from a Float64Array, and a field that changes from a
  // small integer to a double changes the tracker's map, which deoptimised the parse loop
  // compiled against the old one at the end of every later call (intermittently, ~200-400 times
  // per run, seen with --trace-deopt).
  private upperAnchorRow = -0.5;
  private upperAnchorHi = -0;
  private lowerAnchorRow = -0.5;
  private lowerAnchorLo = -0;
  private intervalMin = -Infinity;
  private intervalMax = Infinity;
  /** Count of rows whose time cell was not a number (excluded from the fit). */
  missing = 0;
  maxResidualS = 0;

  private readonly referenceIntervalS: number;
  /** 0.3 reference interval: the residual a stamp may have before it is checked closely. */
  private readonly jitterS: number;
  private readonly findings: LineFindingCollector;
  // Printed resolution of the last stamp, kept while its exponent and factor repeat.
  private resolutionExponent = 0x7fff;
  private resolutionFactorS = -0;
  private resolutionS = -0;
  private halfResolutionS = -0;

  constructor(referenceIntervalS: number, findings: LineFindingCollector) {
    this.referenceIntervalS = referenceIntervalS;
    this.jitterS = 0.3 * referenceIntervalS;
    this.findings = findings;
  }

  /**
   * One time stamp in seconds, the power of ten of its last printed digit, the seconds per unit
   * of the time column, its sample index and its line.
   */
  add(tS: number, lastDigitExponent: number, factorS: number, row: number, line: number): void {
    // Fast path: the common stamp, past the anchor window, at the printed resolution of the stamp
    // before, not earlier than it and near the prediction (no finding, no prediction restart).
    // It makes exactly the updates of addGeneral, in the same order.
    const n = this.n;
    const dt = this.referenceIntervalS;
    const prediction = this.prediction + dt * (row - this.lastRow);
    const residual = tS - prediction;
    if (
      lastDigitExponent === this.resolutionExponent && factorS === this.resolutionFactorS &&
      this.upperAnchorRow >= 0 && (n & (n - 1)) !== 0 && dt > 0 &&
      tS >= this.prev && Math.abs(residual) <= this.jitterS
    ) {
      const u = tS - this.first;
      const halfWidth = this.halfResolutionS + Math.abs(tS) * 4e-16;
      this.pair(row, u - halfWidth, u + halfWidth);
      this.n = n + 1;
      this.sumI += row;
      // row ** 2, not row * row: an int32 product would overflow past row 46340 and deoptimise
      // the parse loop this is inlined into; a double product is exact below 2^26.5.
      this.sumII += row ** 2;
      this.sumU += u;
      this.sumIU += row * u;
      this.prediction = prediction + residual * 0.0625;
      this.prev = tS;
      this.lastRow = row;
      return;
    }
    this.addGeneral(tS, lastDigitExponent, factorS, row, line);
  }

  /**
   * The stamps times[from..to) with their exponents, as add(times[r], exponents[r], factorS,
   * r + rowShift, r + lineShift) for each r in order, with the running state held in locals.
   */
  addRun(times: Float64Array, exponents: Int16Array, factorS: number, from: number, to: number, rowShift: number, lineShift: number): void {
    const dt = this.referenceIntervalS;
    const jitterS = this.jitterS;
    let r = from;
    while (r < to) {
      // Locals for the fast path of add(); back to the fields for any other stamp and after each
      // block of rows: leaving the loop often gives the optimising compiler feedback for the
      // whole function early (one run over millions of rows was compiled on stack with none for
      // the code after the loop, deoptimised there and ran ~4x slower in its first call).
      const blockEnd = Math.min(to, r + RUN_BLOCK_ROWS);
      const exponent = this.resolutionExponent;
      const halfResolutionS = this.halfResolutionS;
      const first = this.first;
      const upperRow = this.upperAnchorRow;
      const upperHi = this.upperAnchorHi;
      const lowerRow = this.lowerAnchorRow;
      const lowerLo = this.lowerAnchorLo;
      const fast = factorS === this.resolutionFactorS && upperRow >= 0 && dt > 0;
      let n = this.n;
      let sumI = this.sumI;
      let sumII = this.sumII;
      let sumU = this.sumU;
      let sumIU = this.sumIU;
      let prediction = this.prediction;
      let prev = this.prev;
      let lastRow = this.lastRow;
      let intervalMin = this.intervalMin;
      let intervalMax = this.intervalMax;
      if (fast) {
        for (; r < blockEnd; r++) {
          const tS = times[r];
          const row = r + rowShift;
          const predicted = prediction + dt * (row - lastRow);
          const residual = tS - predicted;
          if (!(exponents[r] === exponent && (n & (n - 1)) !== 0 && tS >= prev && Math.abs(residual) <= jitterS)) break;
          const u = tS - first;
          const halfWidth = halfResolutionS + Math.abs(tS) * 4e-16;
          // pair(), inline.
          const du = row - upperRow;
          if (du > 0) {
            const num = u - halfWidth - upperHi;
            const slope = num / du;
            intervalMin = num > intervalMin * du ? slope : intervalMin;
          }
          const dl = row - lowerRow;
          if (dl > 0) {
            const num = u + halfWidth - lowerLo;
            const slope = num / dl;
            intervalMax = num < intervalMax * dl ? slope : intervalMax;
          }
          n++;
          sumI += row;
          sumII += row ** 2;
          sumU += u;
          sumIU += row * u;
          prediction = predicted + residual * 0.0625;
          prev = tS;
          lastRow = row;
        }
      }
      this.n = n;
      this.sumI = sumI;
      this.sumII = sumII;
      this.sumU = sumU;
      this.sumIU = sumIU;
      this.prediction = prediction;
      this.prev = prev;
      this.lastRow = lastRow;
      this.intervalMin = intervalMin;
      this.intervalMax = intervalMax;
      if (r < blockEnd) {
        this.addGeneral(times[r], exponents[r], factorS, r + rowShift, r + lineShift);
        r++;
      }
    }
  }

  private addGeneral(tS: number, lastDigitExponent: number, factorS: number, row: number, line: number): void {
    if (tS !== tS) {
      this.missing++;
      return;
    }
    if (lastDigitExponent !== this.resolutionExponent || factorS !== this.resolutionFactorS) {
      this.resolutionExponent = lastDigitExponent;
      this.resolutionFactorS = factorS;
      this.resolutionS = powerOfTen(lastDigitExponent) * factorS;
      this.halfResolutionS = this.resolutionS * 0.5;
    }
    if (this.n === 0) {
      this.first = tS;
      this.prediction = tS;
    }
    const u = tS - this.first;
    this.bound(row, u, this.halfResolutionS + Math.abs(tS) * 4e-16);
    this.n++;
    this.sumI += row;
    this.sumII += row ** 2;
    this.sumU += u;
    this.sumIU += row * u;
    const dt = this.referenceIntervalS;
    if (this.n > 1 && dt > 0) {
      const step = tS - this.prev;
      this.prediction += dt * (row - this.lastRow);
      const residual = tS - this.prediction;
      const r = Math.abs(residual);
      if (r > this.jitterS || step < 0) {
        const resolutionS = this.resolutionS;
        const far = 1.5 * dt + resolutionS;
        if (step < 0) {
          const prevT = this.prev;
          this.findings.add('uneven-sampling', 'warning', { line }, 'irregular time stamps', () => ({
            message: `Time goes backwards at line ${line}: ${fmt(tS)} s after ${fmt(prevT)} s.`,
            advice: 'The time column is not monotonic; check that the export is one record and not several pasted together.',
            figures: { stepS: step, line },
          }));
          if (residual < -far) this.prediction = tS;
        } else if (residual > far) {
          const intervals = step / dt;
          this.findings.add('uneven-sampling', 'warning', { line }, 'irregular time stamps', () => ({
            message: `Time jumps by ${fmt(step)} s (about ${intervals.toFixed(1)} sample intervals) at line ${line}: samples are missing.`,
            advice: 'A gap in the record distorts the sample rate fitted over it; export one continuous record.',
            figures: { stepS: step, intervals, line },
          }));
          this.prediction = tS;
        } else if (r > resolutionS + 0.3 * dt) {
          if (r > this.maxResidualS) this.maxResidualS = r;
          this.findings.add('uneven-sampling', 'warning', { line }, 'irregular time stamps', () => ({
            message: `The time stamp at line ${line} is ${fmt(residual)} s (${(residual / dt).toFixed(2)} sample intervals) off the even time base.`,
            advice: 'Uneven sampling smears phase measurements; check the scope export settings.',
            figures: { residualS: residual, intervals: residual / dt, line },
          }));
          if (residual < -far) this.prediction = tS;
          else this.prediction += residual * 0.0625;
        } else this.prediction += residual * 0.0625;
      } else this.prediction += residual * 0.0625;
    }
    this.prev = tS;
    this.lastRow = row;
  }

  /**
   * Narrows [intervalMin, intervalMax], the intervals for which an exact uniform grid
   * t_i = t_0 + i dt passes within half a printed resolution of every stamp:
   * lo_j - hi_a <= (j - a) dt <= hi_j - lo_a for every pair of rows. Pairing each row with two
   * anchors suffices in practice: an early row whose upper limit hi_a is nearly touched by the
   * grid, and one whose lower limit lo_a is (with decimal rates these are the stamps that sit on a
   * rounding midpoint). This is the interval form of fitting a line through data ranges
   * (O'Rourke, "An on-line algorithm for fitting straight lines between data ranges", CACM 24(9),
   * 1981), cut down to two anchors so that it costs two multiplications per row.
   */
  private bound(row: number, u: number, halfWidth: number): void {
    if (this.upperAnchorRow < 0) {
      const w = this.window;
      const k = 3 * this.windowCount++;
      w[k] = row;
      w[k + 1] = u;
      w[k + 2] = halfWidth;
      if (this.windowCount === ANCHOR_WINDOW) this.chooseAnchors();
      return;
    }
    this.pair(row, u - halfWidth, u + halfWidth);
    // Re-choose the anchors at 2^k stamps, ranking the window rows with the slope the bounds give
    // by then: each round picks rows nearer their limits, so later rows tighten the bounds more.
    if ((this.n & (this.n - 1)) === 0 && this.intervalMin > 0 && this.intervalMin <= this.intervalMax) {
      this.chooseAnchors(0.5 * (this.intervalMin + this.intervalMax));
    }
  }

  private pair(row: number, lo: number, hi: number): void {
    // The quotient is taken whether or not it is kept, so that the division is off the chain
    // from one row's bound to the next (most rows of a fine-printed record tighten both).
    const du = row - this.upperAnchorRow;
    if (du > 0) {
      const num = lo - this.upperAnchorHi;
      const slope = num / du;
      if (num > this.intervalMin * du) this.intervalMin = slope;
    }
    const dl = row - this.lowerAnchorRow;
    if (dl > 0) {
      const num = hi - this.lowerAnchorLo;
      const slope = num / dl;
      if (num < this.intervalMax * dl) this.intervalMax = slope;
    }
  }

  private chooseAnchors(knownSlope?: number): void {
    const w = this.window;
    const m = this.windowCount;
    if (m < 2) return;
    // A line over the window (least squares unless a slope is given), to find the rows whose
    // limits the grid nearly touches.
    let si = 0;
    let su = 0;
    for (let k = 0; k < m; k++) {
      si += w[3 * k];
      su += w[3 * k + 1];
    }
    const mi = si / m;
    const mu = su / m;
    let sxx = 0;
    let sxy = 0;
    for (let k = 0; k < m; k++) {
      const di = w[3 * k] - mi;
      sxx += di * di;
      sxy += di * (w[3 * k + 1] - mu);
    }
    const slope = knownSlope ?? (sxx > 0 ? sxy / sxx : 0);
    let bestUpper = Infinity;
    let bestLower = Infinity;
    for (let k = 0; k < m; k++) {
      const line = mu + slope * (w[3 * k] - mi);
      const up = w[3 * k + 1] + w[3 * k + 2] - line;
      const down = line - (w[3 * k + 1] - w[3 * k + 2]);
      if (up < bestUpper) {
        bestUpper = up;
        this.upperAnchorRow = w[3 * k];
        this.upperAnchorHi = w[3 * k + 1] + w[3 * k + 2];
      }
      if (down < bestLower) {
        bestLower = down;
        this.lowerAnchorRow = w[3 * k];
        this.lowerAnchorLo = w[3 * k + 1] - w[3 * k + 2];
      }
    }
    // Pair the window rows with the anchors, both ways round.
    for (let k = 0; k < m; k++) {
      const row = w[3 * k];
      const lo = w[3 * k + 1] - w[3 * k + 2];
      const hi = w[3 * k + 1] + w[3 * k + 2];
      this.pair(row, lo, hi);
      const du = this.upperAnchorRow - row;
      if (du > 0 && (this.upperAnchorHi - lo) < this.intervalMax * du) this.intervalMax = (this.upperAnchorHi - lo) / du;
      const dl = this.lowerAnchorRow - row;
      if (dl > 0 && (this.lowerAnchorLo - hi) > this.intervalMin * dl) this.intervalMin = (this.lowerAnchorLo - hi) / dl;
    }
  }

  /**
   * Interval and fitted time of sample 0, in seconds. The least-squares slope over every stamp,
   * unless the stamps are consistent with an exact uniform grid plus rounding to their printed
   * digits: then the middle of the feasible interval range, which rounding cannot bias (with
   * rounded stamps the least-squares slope is off by up to a few 1e-6 when rounding midpoints
   * fall one way in one part of the record and the other way elsewhere).
   */
  fit(): { intervalS: number; startS: number; count: number; method: 'least-squares' | 'resolution-bounds' } | undefined {
    const n = this.n;
    if (n < 2) return undefined;
    if (this.upperAnchorRow < 0) this.chooseAnchors();
    const meanI = this.sumI / n;
    const meanU = this.sumU / n;
    const sxx = this.sumII - n * meanI * meanI;
    const sxy = this.sumIU - n * meanI * meanU;
    if (!(sxx > 0)) return undefined;
    let slope = sxy / sxx;
    let method: 'least-squares' | 'resolution-bounds' = 'least-squares';
    const lo = this.intervalMin;
    const hi = this.intervalMax;
    if (lo <= hi && lo > 0 && Number.isFinite(hi)) {
      const mid = 0.5 * (lo + hi);
      if (Math.abs(mid / slope - 1) < 1e-3) {
        slope = mid;
        method = 'resolution-bounds';
      }
    }
    return { intervalS: slope, startS: this.first + (meanU - slope * meanI), count: n, method };
  }
}

function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString();
}
