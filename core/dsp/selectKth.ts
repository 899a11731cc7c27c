/**
 * The k-th smallest value of `v` (0-based), found by Hoare's selection (Hoare, "Algorithm 65:
 * Find", CACM 4, 1961) with a median-of-three pivot, in place: afterwards v[k] holds it, the
 * values before k are at most it and those after at least it. Expected linear time (a sort of
 * one value per carrier cycle took ~40 ms on 5e5 values, several times per analysis); a
 * numeric sort finishes the job if the partitions stop shrinking fast. Finite values only.
 */
export function selectKth(v: Float64Array, k: number): number {
  let lo = 0;
  let hi = v.length - 1;
  let budget = 2 * Math.ceil(Math.log2(v.length + 1)) + 8;
  while (hi > lo) {
    if (budget-- === 0) {
      v.subarray(lo, hi + 1).sort();
      return v[k]!;
    }
    const mid = lo + ((hi - lo) >> 1);
    // Median of three as the pivot, moved to v[mid].
    if (v[mid]! < v[lo]!) swap(v, mid, lo);
    if (v[hi]! < v[lo]!) swap(v, hi, lo);
    if (v[hi]! < v[mid]!) swap(v, hi, mid);
    const pivot = v[mid]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (v[i]! < pivot) i++;
      while (v[j]! > pivot) j--;
      if (i <= j) {
        swap(v, i, j);
        i++;
        j--;
      }
    }
    // Now v[lo..j] <= pivot <= v[i..hi], and values strictly between j and i equal the pivot.
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return v[k]!;
  }
  return v[k]!;
}

function swap(v: Float64Array, a: number, b: number): void {
  const t = v[a]!;
  v[a] = v[b]!;
  v[b] = t;
}
