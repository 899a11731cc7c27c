/**
 * Machine-speed yardstick for the bench, not part of the product: the barest byte-level CSV
 * reader for the bench's own files (a header line, then rows of plain decimal numbers separated
 * by commas), straight into Float32 columns, with no checks, no findings and no time base. The
 * bench prints its MB/s next to the real parser's, so a slow or busy machine shows as such in
 * the same run (on this machine its speed swung 290-700 MB/s between runs an hour apart).
 */
import { NEG_POW10 } from '../../core/import/composeDecimal.js';

/** Cells per row of such a file: the commas of its header line, plus one. */
export function bareColumnCount(bytes: Uint8Array): number {
  const header = bytes.subarray(0, bytes.indexOf(10));
  return header.reduce((n, b) => n + (b === 44 ? 1 : 0), 1);
}

/** Parses the rows after the header into `columns` (one per cell); returns the rows read. */
export function bareParse(bytes: Uint8Array, columns: Float32Array[]): number {
  const width = columns.length;
  let p = bytes.indexOf(10) + 1;
  const end = bytes.length;
  let row = 0;
  while (p < end) {
    for (let k = 0; k < width; k++) {
      let c = bytes[p]!;
      let negative = false;
      if (c === 45) {
        negative = true;
        c = bytes[++p]!;
      }
      let mantissa = 0;
      while (c >= 48 && c <= 57) {
        mantissa = mantissa * 10 + (c - 48);
        c = bytes[++p]!;
      }
      let fraction = 0;
      if (c === 46) {
        const from = ++p;
        c = bytes[p]!;
        while (c >= 48 && c <= 57) {
          mantissa = mantissa * 10 + (c - 48);
          c = bytes[++p]!;
        }
        fraction = p - from;
      }
      const v = mantissa * NEG_POW10[fraction]!;
      columns[k]![row] = negative ? -v : v;
      p++; // the comma or the line feed
    }
    row++;
  }
  return row;
}
