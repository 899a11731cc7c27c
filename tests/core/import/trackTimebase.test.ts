import { describe, expect, it } from 'vitest';
import { LineFindingCollector } from '../../../core/import/collectLineFindings.js';
import { TimebaseTracker } from '../../../core/import/trackTimebase.js';
import { createRandom } from '../../../core/synth/random.js';

/**
 * A seeded time column: interval dtS printed to `digits` significant digits, with a few gaps,
 * backward steps, jittered and non-numeric stamps, and stamps printed one digit shorter (a
 * trailing zero dropped), so that the printed resolution changes from row to row.
 */
function column(n: number, dtS: number, digits: number, seed: number): { times: Float64Array; exponents: Int16Array } {
  const rnd = createRandom(seed);
  const times = new Float64Array(n);
  const exponents = new Int16Array(n);
  let clockS = 0.25;
  for (let i = 0; i < n; i++) {
    clockS += dtS;
    const u = rnd.uniform();
    if (u < 0.0004) clockS += dtS * (2 + 8 * rnd.uniform());
    else if (u < 0.0007) clockS -= dtS * (1 + 4 * rnd.uniform());
    const jitterS = u > 0.9995 ? 0.6 * dtS : 0;
    let exponent = Math.floor(Math.log10(clockS)) - digits + 1;
    if (rnd.uniform() < 0.1) exponent++;
    const printed = Number((Math.round((clockS + jitterS) / 10 ** exponent) * 10 ** exponent).toPrecision(15));
    times[i] = rnd.uniform() < 0.0003 ? NaN : printed;
    exponents[i] = exponent;
  }
  return { times, exponents };
}

function state(tracker: TimebaseTracker, findings: LineFindingCollector): unknown {
  return { fit: tracker.fit(), missing: tracker.missing, maxResidualS: tracker.maxResidualS, findings: findings.result() };
}

describe('TimebaseTracker', () => {
  // Oracle: the tracker fed one stamp at a time; addRun must make exactly the same calls
  // (common practice, no source).
  it('gives the same fit, bounds and findings from addRun in pieces as from add per row', () => {
    for (const [dtS, digits, seed] of [[1e-6, 9, 1], [2.5e-5, 5, 2], [1e-3, 4, 3], [1e-6, 13, 4]] as const) {
      const n = 40000;
      const { times, exponents } = column(n, dtS, digits, seed);
      const rowShift = 11;
      const lineShift = 4;
      const oneF = new LineFindingCollector(1000);
      const one = new TimebaseTracker(dtS, oneF);
      for (let r = 0; r < n; r++) one.add(times[r], exponents[r], 1, r + rowShift, r + lineShift);
      const runF = new LineFindingCollector(1000);
      const run = new TimebaseTracker(dtS, runF);
      const rnd = createRandom(seed + 100);
      for (let r = 0; r < n; ) {
        const end = Math.min(n, r + Math.floor(rnd.uniform() * 3000));
        if (rnd.uniform() < 0.2) for (; r < end; r++) run.add(times[r], exponents[r], 1, r + rowShift, r + lineShift);
        else {
          run.addRun(times, exponents, 1, r, end, rowShift, lineShift);
          r = end;
        }
      }
      expect(oneF.count('uneven-sampling')).toBeGreaterThan(10); // the record really has findings
      expect(one.missing).toBeGreaterThan(0);
      expect(state(run, runF)).toEqual(state(one, oneF));
    }
  });

  it('reports a gap and a backward step past the anchor window at their lines', () => {
    // Even 10 us stamps printed to 9 digits; 3 samples missing before row 6000 and a step back
    // at row 9000. Lines are row + 2 (header on line 1). Common practice, no source.
    const n = 12000;
    const times = new Float64Array(n);
    const exponents = new Int16Array(n).fill(-13);
    for (let r = 0; r < n; r++) times[r] = Number(((r + (r >= 6000 ? 3 : 0)) * 1e-5 - (r === 9000 ? 5e-5 : 0)).toFixed(13));
    for (const batch of [false, true]) {
      const findings = new LineFindingCollector();
      const tracker = new TimebaseTracker(1e-5, findings);
      if (batch) tracker.addRun(times, exponents, 1, 0, n, 0, 2);
      else for (let r = 0; r < n; r++) tracker.add(times[r], exponents[r], 1, r, r + 2);
      const listed = findings.result();
      expect(listed.map((f) => f.at?.line)).toEqual([6002, 9002, 9003]);
      expect(listed[0].message).toMatch(/about 4\.0 sample intervals/);
      expect(listed[1].message).toMatch(/backwards at line 9002/);
    }
  });

  it('keeps the least-squares slope when jitter rules out an exact grid', () => {
    // Slope of the least-squares line, Press et al., Numerical Recipes 3rd ed. §15.2 (two-pass
    // form, computed here independently). Jitter up to 0.2 interval: no findings.
    const n = 50000;
    const dtS = 2e-6;
    const rnd = createRandom(7);
    const times = new Float64Array(n);
    const exponents = new Int16Array(n).fill(-15);
    for (let r = 0; r < n; r++) times[r] = 1.5 + r * dtS + (rnd.uniform() - 0.5) * 0.4 * dtS;
    const findings = new LineFindingCollector();
    const tracker = new TimebaseTracker(dtS, findings);
    tracker.addRun(times, exponents, 1, 0, n, 0, 2);
    let mi = 0;
    let mt = 0;
    for (let r = 0; r < n; r++) {
      mi += r / n;
      mt += (times[r] - 1.5) / n;
    }
    let sxx = 0;
    let sxy = 0;
    for (let r = 0; r < n; r++) {
      sxx += (r - mi) ** 2;
      sxy += (r - mi) * (times[r] - 1.5 - mt);
    }
    const fit = tracker.fit();
    expect(fit?.method).toBe('least-squares');
    expect(Math.abs(fit!.intervalS / (sxy / sxx) - 1)).toBeLessThan(1e-9);
    expect(findings.result()).toEqual([]);
  });
});
