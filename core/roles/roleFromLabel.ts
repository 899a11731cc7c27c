import type { BaseRole, Role } from '../model/roles.js';

/**
 * Reads a channel role from a column label as scopes and users write them: "R1-R2", "REF",
 * "Excitation", "S1-S3", "V(S3,S2)", "S2 - S1", "SIN", "cosine", "CT out", with an optional
 * unit prefix "coarse", "fine", "medium" or a speed such as "1X"/"36X" ("36X S1-S3",
 * "fine.sin"). Terminal names are those of the trade (R1, R2, S1..S4); a resolver's S1-S3 /
 * S2-S4 windings are reported as "s1s3" / "s2s4" and mapped by the caller once the kind is known.
 * Returns undefined when the label says nothing about the role ("CH1", "Channel 2").
 */
export type LabelRole = Role | { readonly unit: string; readonly base: 's2s4' | 's4s2' };

const PREFIX = /^(coarse|fine|medium|\d{1,3}x)(?:[\s._:-]+|(?=[sr]\d))/;

export function roleFromLabel(label: string): LabelRole | undefined {
  let text = label.trim().toLowerCase();
  let unit = '';
  const prefix = PREFIX.exec(text);
  if (prefix) {
    unit = prefix[1]!;
    text = text.slice(prefix[0].length);
  }
  const base = baseRole(text);
  return base ? { unit, base } : undefined;
}

function baseRole(text: string): BaseRole | 's2s4' | 's4s2' | undefined {
  const pair = /(?:^|[^a-z0-9])s([1-4])\s*(?:[-–,/]|\s)?\s*s([1-4])(?![0-9])/.exec(` ${text}`);
  if (pair && pair[1] !== pair[2]) {
    const key = `s${pair[1]}s${pair[2]}`;
    if (['s1s3', 's3s2', 's2s1', 's3s1', 's2s3', 's1s2', 's2s4', 's4s2'].includes(key)) {
      return key as BaseRole | 's2s4' | 's4s2';
    }
    return undefined;
  }
  if (/(?:^|[^a-z0-9])r1\s*(?:[-–,/]|\s)?\s*r2(?![0-9])/.test(` ${text}`)) return 'ref';
  if (/^(ref|reference|exc|excitation|rotor|carrier)\b/.test(text)) return 'ref';
  if (/^(sin|sine)\b/.test(text)) return 'sin';
  if (/^(cos|cosine)\b/.test(text)) return 'cos';
  if (/^(ct|control transformer)\b/.test(text)) return 'ct';
  return undefined;
}
