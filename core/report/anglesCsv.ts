import type { Analysis } from '../model/analysis.js';

/**
 * The angle trace as CSV text (RFC 4180; '.' decimal mark; LF line ends): one row per carrier
 * cycle of the primary unit, with each unit's wrapped and unwrapped angle in degrees.
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
  const rows = [header.join(',')];
  for (let m = 0; m < primary.t.length; m++) {
    const row = [fmt(primary.t[m]!, 9)];
    for (const u of units) {
      const a = u.angle!;
      row.push(fmt(a.deg[m]!, 6), fmt(a.unwrappedDeg[m]!, 6));
    }
    rows.push(row.join(','));
  }
  return `${rows.join('\n')}\n`;
}

function fmt(v: number, digits: number): string {
  return Number.isFinite(v) ? v.toFixed(digits) : '';
}
