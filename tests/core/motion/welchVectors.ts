/**
 * Loads tests/reference/welch-vectors.json, written offline by
 * scripts/reference/gen_welch_vectors.py (scipy.signal.welch, fixed seeds).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

export interface WelchCase {
  name: string;
  fs: number;
  nperseg: number;
  noverlap: number;
  detrend: 'linear' | 'constant';
  x: number[];
  f: number[];
  psd: number[];
  stats: { meanPsd: number; integral: number; variance: number };
}

export interface WelchVectors {
  numpy: string;
  scipy: string;
  cases: WelchCase[];
}

let cached: WelchVectors | undefined;

export function welchVectors(): WelchVectors {
  cached ??= JSON.parse(readFileSync(join(process.cwd(), 'tests', 'reference', 'welch-vectors.json'), 'utf8')) as WelchVectors;
  return cached;
}

export function welchCase(name: string): WelchCase {
  const c = welchVectors().cases.find((x) => x.name === name);
  if (!c) throw new Error(`welch-vectors.json has no case "${name}"`);
  return c;
}
