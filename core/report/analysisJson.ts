import type { Analysis, UnitAngle } from '../model/analysis.js';
import type { MotionAnalysis } from '../motion/analyzeMotion.js';

/** Identifies the JSON contract; bumped only on a breaking change. */
export const ANALYSIS_SCHEMA = 'statorscope.analysis/1';

export interface ReportMeta {
  /** The capture's file name as the user gave it. */
  readonly file: string;
  readonly version: string;
}

/**
 * The analysis as plain JSON data (schema statorscope.analysis/1): typed arrays become arrays,
 * non-finite numbers become null. Times are rounded to 1 ns and angles to 1 µ°, well below
 * anything a capture resolves, to keep files small.
 */
export function analysisToJson(analysis: Analysis, meta: ReportMeta): Record<string, unknown> {
  const angle = (a: UnitAngle | null): Record<string, unknown> | null =>
    a && {
      t: roundArray(a.t, 1e9),
      deg: roundArray(a.deg, 1e6),
      unwrappedDeg: roundArray(a.unwrappedDeg, 1e6),
      ambiguous180: a.ambiguous180,
    };
  return {
    schema: ANALYSIS_SCHEMA,
    generator: { name: 'statorscope', version: meta.version },
    input: { file: meta.file, ...clean(analysis.input) as object },
    carrier: clean(analysis.carrier),
    angle: angle(analysis.angle),
    units: analysis.units.map((u) => ({
      ...(clean({ ...u, angle: undefined, ctError: undefined }) as object),
      angle: angle(u.angle),
      ctError: u.ctError && {
        gradientVPerDeg: finite(u.ctError.gradientVPerDeg),
        gradientSource: u.ctError.gradientSource,
        nullCrossings: clean(u.ctError.nullCrossings),
        t: roundArray(u.ctError.tS, 1e9),
        inPhaseV: roundArray(u.ctError.inPhaseV, 1e6),
        quadratureMv: roundArray(u.ctError.quadratureMv, 1e3),
        errorDeg: roundArray(u.ctError.errorDeg, 1e6),
      },
    })),
    motion: motion(analysis.motion),
    accuracy: clean(analysis.accuracy),
    twoSpeed: analysis.twoSpeed && { ...(clean({ ...analysis.twoSpeed, coarseErrorDeg: undefined }) as object), coarseErrorDeg: roundArray(analysis.twoSpeed.coarseErrorDeg, 1e6) },
    tracking: analysis.tracking && { ...(clean({ ...analysis.tracking, diffDeg: undefined }) as object), diffDeg: roundArray(analysis.tracking.diffDeg, 1e6) },
    findings: clean(analysis.findings),
  };
}

/** Motion figures without the per-cycle arrays (velocity goes to the angle CSV, not the JSON). */
function motion(m: MotionAnalysis | null): Record<string, unknown> | null {
  if (!m) return null;
  const j = m.jitter;
  return {
    segments: clean(m.segments),
    jitter: j && clean({
      rmsArcmin: j.rmsArcmin,
      ppArcmin: j.ppArcmin,
      dominantHz: j.dominantHz,
      tones: j.tones,
      hunting: j.hunting,
      source: j.source,
      bandRmsArcmin: j.bandRmsArcmin,
      noiseFloorArcmin2PerHz: j.noiseFloorArcmin2PerHz,
    }),
    steps: clean(m.steps),
  };
}

function finite(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

function roundArray(values: Float64Array, scale: number): (number | null)[] {
  const out = new Array<number | null>(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    out[i] = Number.isFinite(v) ? Math.round(v * scale) / scale : null;
  }
  return out;
}

/** Deep copy that maps non-finite numbers to null, typed arrays to arrays, and drops undefined fields. */
function clean(value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (ArrayBuffer.isView(value)) return Array.from(value as Float64Array, (v) => (Number.isFinite(v) ? v : null));
  if (Array.isArray(value)) return value.map(clean);
  if (value && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (v !== undefined) out[k] = clean(v);
    return out;
  }
  return value;
}
