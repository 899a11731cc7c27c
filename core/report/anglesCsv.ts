import type { Analysis } from '../model/analysis.js';

/**
 * The angle trace as CSV text (RFC 4180; '.' decimal mark; LF line ends): one row per carrier
 * cycle, with each unit's wrapped and unwrapped angle in degrees, a two-speed set's combined
 * angle and coarse error, the primary trace's velocity (deg/s), a CT's error output, and the
 * tracking error between two units (arcmin).
 */
export function anglesToCsv(analysis: Analysis): string {
  const units = analysis.units.filter((u) => u.angle !== null);
  if (units.length === 0) return 't_s\n';
  const primary = units[0]!.angle!;
  const header = ['t_s'];
  for (const u of units) {
    const p = units.length > 1 ? `${u.id}_` : '';
    header.push(`${p}angle_deg`, `${p}unwrapped_deg`);
  }
  const combined = analysis.twoSpeed ? analysis.angle : null;
  if (combined) header.push('combined_angle_deg', 'combined_unwrapped_deg', 'coarse_error_deg');
  const velocity = analysis.motion?.velocityDegPerS;
  if (velocity) header.push('velocity_deg_per_s');
  const ct = analysis.units.find((u) => u.ctError !== null)?.ctError;
  if (ct) header.push('ct_error_v', 'ct_error_deg');
  const tracking = analysis.tracking;
  if (tracking) header.push('tracking_error_arcmin');
  const rows = [header.join(',')];
  for (let m = 0; m < primary.t.length; m++) {
    const row = [fmt(primary.t[m]!, 9)];
    for (const u of units) {
      const a = u.angle!;
      row.push(fmt(a.deg[m]!, 6), fmt(a.unwrappedDeg[m]!, 6));
    }
    if (combined) row.push(fmt(combined.deg[m]!, 6), fmt(combined.unwrappedDeg[m]!, 6), fmt(analysis.twoSpeed!.coarseErrorDeg[m]!, 6));
    if (velocity) row.push(fmt(velocity[m]!, 6));
    if (ct) row.push(fmt(ct.inPhaseV[m]!, 6), fmt(ct.errorDeg[m]!, 6));
    if (tracking) row.push(fmt(tracking.diffDeg[m]! * 60, 4));
    rows.push(row.join(','));
  }
  return `${rows.join('\n')}\n`;
}

function fmt(v: number, digits: number): string {
  return Number.isFinite(v) ? v.toFixed(digits) : '';
}
