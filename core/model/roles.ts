/**
 * Channel roles. A role may carry a unit prefix for multi-unit captures ("coarse.s1s3").
 *
 * Line-to-line roles are named by the two stator leads, potential of the first minus the second:
 * `s1s3` = E(S1-S3). The reversed pairs are the same voltage negated.
 */
export const ROLE_NAMES = [
  'ref',
  's1s3', 's3s2', 's2s1',
  's3s1', 's2s3', 's1s2',
  'sin', 'cos',
  'ct',
  'ignore',
] as const;

export type BaseRole = (typeof ROLE_NAMES)[number];

/** A role with an optional unit prefix. */
export interface Role {
  readonly unit: string; // "" for the single-unit case
  readonly base: BaseRole;
}

/** The three canonical synchro lines and their reversed spellings, with the sign to apply. */
export const SYNCHRO_LINE_OF: Readonly<Record<string, { line: 0 | 1 | 2; sign: 1 | -1 }>> = {
  s1s3: { line: 0, sign: 1 },
  s3s2: { line: 1, sign: 1 },
  s2s1: { line: 2, sign: 1 },
  s3s1: { line: 0, sign: -1 },
  s2s3: { line: 1, sign: -1 },
  s1s2: { line: 2, sign: -1 },
};

export function formatRole(role: Role): string {
  return role.unit ? `${role.unit}.${role.base}` : role.base;
}

/** Parses "s1s3", "S1-S3", "coarse.sin"; returns undefined for anything else. */
export function parseRole(text: string): Role | undefined {
  const trimmed = text.trim().toLowerCase();
  const dot = trimmed.lastIndexOf('.');
  const unit = dot >= 0 ? trimmed.slice(0, dot) : '';
  const base = (dot >= 0 ? trimmed.slice(dot + 1) : trimmed).replace(/[\s_-]/g, '');
  if (unit !== '' && !/^[a-z][a-z0-9]*$/.test(unit)) return undefined;
  return (ROLE_NAMES as readonly string[]).includes(base) ? { unit, base: base as BaseRole } : undefined;
}
