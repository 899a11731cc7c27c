import { SYNCHRO_LINE_OF } from '../model/roles.js';

/**
 * Null angles of the stator lines (standard synchro equations, NEETS Module 15): E(S1−S3) at
 * 0°/180°, E(S3−S2) at 60°/240°, E(S2−S1) at 120°/300° (the reversed pairs null at the same
 * angles); resolver sine winding at 0°/180°, cosine winding at 90°/270°.
 *
 * The two null angles of a line role (degrees; a unit prefix such as "fine." is ignored), or
 * undefined for a role without nulls.
 */
export function nullAnglesDeg(role: string): readonly [number, number] | undefined {
  const base = role.slice(role.lastIndexOf('.') + 1).toLowerCase();
  if (base === 'sin') return [0, 180];
  if (base === 'cos') return [90, 270];
  const map = SYNCHRO_LINE_OF[base];
  if (!map) return undefined;
  const a = map.line * 60;
  return [a, a + 180];
}
