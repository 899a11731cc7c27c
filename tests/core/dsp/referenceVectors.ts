/**
 * Loads tests/reference/sine-fit-vectors.json, written offline by
 * scripts/reference/gen_sine_fit_vectors.py (numpy 2.4.6 / scipy 1.17.1, fixed seeds).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

export interface FftVector { n: number; x: number[]; re: number[]; im: number[] }
export interface WindowMetrics { n: number; coherentGain: number; nenbwBins: number; samples: Record<string, number> }
export interface SineFitCase {
  name: string;
  n: number;
  sampleRateHz: number;
  truth: { frequencyHz: number; amplitude: number; phaseRad: number; offset: number; thirdHarmonicRelative: number; snrDb: number; noiseSigma: number };
  x: number[];
  scipy: { frequencyHz: number; a: number; b: number; offset: number; residualRms: number; status: number; optimality: number };
  crlb: { frequencyHz2: number; phaseAtStartRad2: number; phaseAtCentreRad2: number };
}
export interface ReferenceVectors {
  numpy: string;
  scipy: string;
  fft: FftVector[];
  windows: Record<'hann' | 'blackmanHarris4' | 'flatTop', WindowMetrics>;
  sineFit: SineFitCase[];
  grandke: { n: number; worstBiasBins: number; rows: { cycles: number; phaseRad: number; estimateBins: number }[] };
  harmonics: {
    n: number;
    sampleRateHz: number;
    frequencyHz: number;
    harmonics: number;
    truth: { thd: number; offset: number; noiseSigma: number; amplitudes: Record<string, number> };
    x: number[];
    lstsq: { offset: number; a: number[]; b: number[]; amplitudes: number[]; thd: number; residualRms: number };
  };
}

let cached: ReferenceVectors | undefined;

export function referenceVectors(): ReferenceVectors {
  cached ??= JSON.parse(readFileSync(join(process.cwd(), 'tests', 'reference', 'sine-fit-vectors.json'), 'utf8')) as ReferenceVectors;
  return cached;
}
