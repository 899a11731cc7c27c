import { describe, expect, it } from 'vitest';
import { blackmanHarris4Window, flatTopWindow, hannWindow, windowGains } from '../../../core/dsp/windows.js';
import { referenceVectors } from './referenceVectors.js';

const N = 4096;

describe('window gains (periodic windows, N = 4096)', () => {
  // Harris 1978 Table 1 (Hann: coherent gain 0.50, ENBW 1.50 bins; minimum 4-term
  // Blackman–Harris: 0.36, 2.00) and Heinzel, Rüdiger & Schilling 2002 window list (Hann NENBW
  // 1.5000, BH92 2.0044; table values from memory); flat-top: scipy.signal.windows.flattop
  // (4096, sym=False), 0.216 / 3.770, computed offline with scipy.
  const table = [
    { name: 'hann', w: hannWindow(N), cg: 0.5, nenbw: 1.5 },
    { name: 'blackmanHarris4', w: blackmanHarris4Window(N), cg: 0.359, nenbw: 2.004 },
    { name: 'flatTop', w: flatTopWindow(N), cg: 0.216, nenbw: 3.77 },
  ] as const;

  for (const row of table) {
    it(`${row.name}: coherent gain ${row.cg} and NENBW ${row.nenbw} bins to 3 decimals`, () => {
      const g = windowGains(row.w);
      expect(Math.abs(g.coherentGain - row.cg)).toBeLessThan(5e-4);
      expect(Math.abs(g.nenbwBins - row.nenbw)).toBeLessThan(5e-4);
    });

    it(`${row.name}: equals scipy.signal.windows (sym=False) pointwise and in gains (offline scipy vector)`, () => {
      const ref = referenceVectors().windows[row.name];
      expect(ref.n).toBe(N);
      for (const [i, v] of Object.entries(ref.samples)) expect(Math.abs(row.w[Number(i)] - v)).toBeLessThan(1e-15);
      const g = windowGains(row.w);
      expect(g.coherentGain).toBeCloseTo(ref.coherentGain, 13);
      expect(g.nenbwBins).toBeCloseTo(ref.nenbwBins, 12);
    });
  }

  it('hannWindow is periodic: w[0] = 0, w[N/2] = 1 and w[k] = w[N − k] (Harris 1978 DFT-even definition)', () => {
    const w = hannWindow(16);
    expect(w[0]).toBe(0);
    expect(w[8]).toBeCloseTo(1, 15);
    for (let k = 1; k < 16; k++) expect(w[k]).toBeCloseTo(w[16 - k], 15);
  });

  it('degenerate and bad lengths: n = 0 gives an empty window, n = 1 gives [1] (as scipy), others throw', () => {
    expect(hannWindow(0).length).toBe(0);
    expect(Array.from(flatTopWindow(1))).toEqual([1]);
    expect(() => blackmanHarris4Window(-1)).toThrow(RangeError);
    expect(() => hannWindow(2.5)).toThrow(RangeError);
    expect(() => windowGains([])).toThrow(RangeError);
  });
});
