import { describe, expect, it } from 'vitest';
import { selectKth } from '../../../core/dsp/selectKth.js';
import { createRandom } from '../../../core/synth/random.js';

describe('selectKth(v, k) against a full sort (the oracle: sorted order statistics)', () => {
  it('gives the k-th smallest for every k on seeded data with many ties, runs, and sorted and reversed inputs, and leaves it partitioned', () => {
    const rnd = createRandom(99);
    const inputs: Float64Array[] = [];
    for (const n of [1, 2, 3, 7, 64, 257, 1000]) {
      inputs.push(Float64Array.from({ length: n }, () => rnd.normal()));
      inputs.push(Float64Array.from({ length: n }, () => Math.round(rnd.normal() * 2)));
      inputs.push(Float64Array.from({ length: n }, (_, i) => i));
      inputs.push(Float64Array.from({ length: n }, (_, i) => n - i));
      inputs.push(new Float64Array(n).fill(4));
    }
    for (const x of inputs) {
      const sorted = Float64Array.from(x).sort();
      for (let k = 0; k < x.length; k += Math.max(1, Math.floor(x.length / 37))) {
        const v = Float64Array.from(x);
        // Equal as numbers (a sort orders −0 before +0; the selection takes them as equal).
        expect(selectKth(v, k) === sorted[k]).toBe(true);
        for (let i = 0; i < k; i++) expect(v[i]!).toBeLessThanOrEqual(v[k]!);
        for (let i = k + 1; i < v.length; i++) expect(v[i]!).toBeGreaterThanOrEqual(v[k]!);
      }
    }
  });
});
