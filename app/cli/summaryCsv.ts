/** One row of the batch summary: a capture's headline figures, or why it failed. */
export interface SummaryRow {
  readonly file: string;
  readonly status: 'ok' | 'failed';
  readonly json: string;
  readonly unitKind: string;
  readonly carrierHz: number | null;
  readonly transformationRatio: string;
  readonly phaseLeadDeg: string;
  readonly angleMinDeg: number | null;
  readonly angleMaxDeg: number | null;
  readonly jitterRmsArcmin: number | null;
  readonly findings: string;
  readonly error: string;
}

export const SUMMARY_HEADER = [
  'file',
  'status',
  'json',
  'unit_kind',
  'carrier_hz',
  'transformation_ratio',
  'phase_lead_deg',
  'angle_min_deg',
  'angle_max_deg',
  'jitter_rms_arcmin',
  'findings',
  'error',
] as const;

type Json = Record<string, unknown>;

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/**
 * The summary row read back from an analysis JSON document (statorscope.analysis/1). Units are
 * joined with ";" in their order; the angle range is over the primary unwrapped angle; jitter is
 * motion.jitter.rmsArcmin when the analysis has it; findings are the warning and error codes.
 */
export function summaryRowFromJson(file: string, jsonFile: string, doc: Json): SummaryRow {
  const units = Array.isArray(doc.units) ? (doc.units as Json[]) : [];
  const join = (pick: (u: Json) => unknown, digits: number): string =>
    units.map((u) => {
      const v = num(pick(u));
      return v === null ? '' : String(Number(v.toFixed(digits)));
    }).join(';');
  const angle = doc.angle as Json | null | undefined;
  const unwrapped = Array.isArray(angle?.unwrappedDeg) ? (angle.unwrappedDeg as unknown[]) : [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of unwrapped) {
    if (typeof v === 'number' && Number.isFinite(v)) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  const motion = doc.motion as Json | null | undefined;
  const jitter = motion?.jitter as Json | null | undefined;
  const findings = Array.isArray(doc.findings) ? (doc.findings as Json[]) : [];
  return {
    file,
    status: 'ok',
    json: jsonFile,
    unitKind: units.map((u) => String(u.kind ?? '')).join(';'),
    carrierHz: num((doc.carrier as Json | undefined)?.frequencyHz),
    transformationRatio: join((u) => u.transformationRatio, 5),
    phaseLeadDeg: join((u) => u.phaseLeadDeg, 3),
    angleMinDeg: lo <= hi ? lo : null,
    angleMaxDeg: lo <= hi ? hi : null,
    jitterRmsArcmin: num(jitter?.rmsArcmin),
    findings: findings.filter((f) => f.severity !== 'info').map((f) => String(f.code)).join(' '),
    error: '',
  };
}

export function failedSummaryRow(file: string, message: string): SummaryRow {
  return {
    file,
    status: 'failed',
    json: '',
    unitKind: '',
    carrierHz: null,
    transformationRatio: '',
    phaseLeadDeg: '',
    angleMinDeg: null,
    angleMaxDeg: null,
    jitterRmsArcmin: null,
    findings: '',
    error: message,
  };
}

/** The summary as CSV text (RFC 4180: comma-separated, CRLF-free, fields quoted when needed). */
export function formatSummaryCsv(rows: readonly SummaryRow[]): string {
  const fixed = (v: number | null, digits: number): string => (v === null ? '' : String(Number(v.toFixed(digits))));
  const lines = [SUMMARY_HEADER.join(',')];
  for (const r of rows) {
    lines.push(
      [
        r.file,
        r.status,
        r.json,
        r.unitKind,
        fixed(r.carrierHz, 4),
        r.transformationRatio,
        r.phaseLeadDeg,
        fixed(r.angleMinDeg, 3),
        fixed(r.angleMaxDeg, 3),
        fixed(r.jitterRmsArcmin, 3),
        r.findings,
        r.error,
      ]
        .map(quoteCsv)
        .join(','),
    );
  }
  return `${lines.join('\n')}\n`;
}

/** RFC 4180 §2 rules 6-7: quote a field holding a comma, quote or line break; double its quotes. */
export function quoteCsv(field: string): string {
  return /[",\r\n]/.test(field) ? `"${field.replace(/"/g, '""')}"` : field;
}
