import type { Capture } from '../model/capture.js';
import { CaptureError } from '../model/errors.js';
import { finding, type Finding } from '../model/findings.js';
import { formatRole, parseRole, type BaseRole, type Role } from '../model/roles.js';
import { roleFromLabel } from './roleFromLabel.js';
import { channelSignalStats, type ChannelSignalStats } from './channelSignalStats.js';

export type UnitKind = 'synchro' | 'resolver' | 'ct';

export interface RoleOptions {
  /** User-set roles: role name → channel selector (label, "chN" = N-th channel, or a 1-based number). */
  readonly overrides?: Readonly<Record<string, string>>;
  /** What the stator channels are, when the labels and signals leave it open. */
  readonly kind?: UnitKind;
}

export interface RoleAssignment {
  /** Role per capture channel; undefined = not used. */
  readonly roles: readonly (Role | undefined)[];
  /** How each channel's role was decided. */
  readonly basis: readonly ('user' | 'label' | 'signal' | 'column-order' | 'unused')[];
  readonly findings: Finding[];
}

/**
 * Decides which channel is the excitation and which are stator lines: the user's `--roles`
 * first, then the column labels, then the signals (the three synchro lines sum to zero by
 * Kirchhoff's law; the excitation is the steady, largest carrier). Whatever rests on column order
 * alone is reported in a `roles-guessed` finding.
 */
export function assignRoles(capture: Capture, options: RoleOptions = {}): RoleAssignment {
  const n = capture.channels.length;
  const roles: (Role | undefined)[] = new Array(n).fill(undefined);
  const basis: RoleAssignment['basis'][number][] = new Array(n).fill('unused');
  const findings: Finding[] = [];

  for (const [roleText, selector] of Object.entries(options.overrides ?? {})) {
    const role = parseRole(roleText);
    if (!role) {
      throw new CaptureError(
        `--roles: "${roleText}" is not a role; use ref, s1s3, s3s2, s2s1, s3s1, s2s3, s1s2, sin, cos, ct or ignore, optionally with a unit prefix such as coarse. or fine.`,
      );
    }
    const index = selectChannel(capture, selector);
    if (index === undefined) {
      throw new CaptureError(
        `--roles: no channel "${selector}" for ${roleText}; the channels are ${capture.channels.map((c, i) => `ch${i + 1} "${c.label}"`).join(', ')}`,
      );
    }
    if (basis[index] === 'user') {
      throw new CaptureError(`--roles: channel "${selector}" is given two roles; give each channel one role`);
    }
    roles[index] = role;
    basis[index] = 'user';
  }

  const kindHint = options.kind ?? (capture.channels.some((c) => /s4/i.test(c.label)) ? 'resolver' : undefined);
  capture.channels.forEach((channel, i) => {
    if (basis[i] !== 'unused') return;
    const found = roleFromLabel(channel.label);
    if (!found) return;
    let base: BaseRole;
    if (found.base === 's2s4' || found.base === 's4s2') base = 'cos';
    else if (kindHint === 'resolver' && (found.base === 's1s3' || found.base === 's3s1')) base = 'sin';
    else base = found.base;
    roles[i] = { unit: found.unit, base };
    basis[i] = 'label';
  });

  const open = roles.map((r, i) => (r === undefined && basis[i] === 'unused' ? i : -1)).filter((i) => i >= 0);
  if (open.length > 0) guessFromSignals(capture, open, roles, basis, options.kind, findings);

  const roleCount = new Map<string, number>();
  roles.forEach((r) => r && roleCount.set(formatRole(r), (roleCount.get(formatRole(r)) ?? 0) + 1));
  for (const [role, count] of roleCount) {
    if (count > 1 && !role.endsWith('ignore')) {
      throw new CaptureError(`${count} channels have the role ${role}; give each channel its own role with --roles`);
    }
  }
  return { roles, basis, findings };
}

function selectChannel(capture: Capture, selector: string): number | undefined {
  const s = selector.trim().toLowerCase();
  const byLabel = capture.channels.findIndex((c) => c.label.trim().toLowerCase() === s);
  if (byLabel >= 0) return byLabel;
  const m = /^(?:ch|channel)?\s*(\d+)$/.exec(s);
  if (m) {
    const k = Number(m[1]) - 1;
    if (k >= 0 && k < capture.channels.length) return k;
  }
  return undefined;
}

function guessFromSignals(
  capture: Capture,
  open: number[],
  roles: (Role | undefined)[],
  basis: RoleAssignment['basis'][number][],
  kind: UnitKind | undefined,
  findings: Finding[],
): void {
  const stats = open.map((i) => channelSignalStats(capture.channels[i]!.samples, capture.sampleCount));
  const live = open.filter((_, k) => stats[k]!.acRms > 0);
  const statOf = (i: number): ChannelSignalStats => stats[open.indexOf(i)]!;
  const hasRef = roles.some((r) => r?.base === 'ref');
  const labelled = roles.filter((r) => r && r.base !== 'ref' && r.base !== 'ignore').length;
  const assigned: string[] = [];
  const set = (i: number, base: BaseRole, how: 'signal' | 'column-order'): void => {
    roles[i] = { unit: '', base };
    basis[i] = how;
    assigned.push(`${capture.channels[i]!.label} → ${base}${how === 'column-order' ? ' (by column order)' : ''}`);
  };

  let pool = live.slice();
  // Three channels that sum to zero sample by sample are the synchro's line-to-line voltages.
  const triple = labelled === 0 && pool.length >= 3 && kind !== 'resolver' ? kirchhoffTriple(capture, pool) : undefined;
  // The excitation: the largest channel whose carrier amplitude is steady, provided enough
  // channels remain to solve an angle (two stator signals, or one CT output).
  const statorsLeft = labelled + pool.length - 1;
  if (!hasRef && pool.length >= 1 && (statorsLeft >= 2 || kind === 'ct')) {
    const rest = triple ? pool.filter((i) => !triple.includes(i)) : pool;
    const biggest = Math.max(...pool.map((i) => statOf(i).acRms));
    const pick = rest
      .filter((i) => statOf(i).steadiness < 0.05 && (triple !== undefined || statOf(i).acRms >= 0.95 * biggest))
      .sort((a, b) => statOf(b).acRms - statOf(a).acRms)[0];
    if (pick !== undefined) {
      set(pick, 'ref', 'signal');
      pool = pool.filter((i) => i !== pick);
    }
  }
  if (triple) {
    const lines: BaseRole[] = ['s1s3', 's3s2', 's2s1'];
    triple.forEach((i, k) => set(i, lines[k]!, 'column-order'));
    pool = pool.filter((i) => !triple.includes(i));
  } else if (labelled === 0) {
    if (kind === 'ct' && pool.length >= 1) {
      set(pool[0]!, 'ct', 'column-order');
      pool = pool.slice(1);
    } else if (pool.length >= 2 && kind === 'synchro') {
      set(pool[0]!, 's1s2', 'column-order');
      set(pool[1]!, 's3s2', 'column-order');
      pool = pool.slice(2);
    } else if (pool.length >= 2) {
      set(pool[0]!, 'sin', 'column-order');
      set(pool[1]!, 'cos', 'column-order');
      pool = pool.slice(2);
    }
  }
  if (assigned.length > 0) {
    const byOrder = assigned.some((a) => a.includes('column order'));
    findings.push(
      finding(
        'roles-guessed',
        byOrder ? 'warning' : 'info',
        `Channel roles were not in the labels and were inferred: ${assigned.join('; ')}.`,
        {
          advice: byOrder
            ? 'Which stator line is which cannot be told from the signals alone; if the angle is off by 120° or runs backwards, set the roles with --roles (e.g. --roles ref=ch1,s1s3=ch2,s3s2=ch3,s2s1=ch4).'
            : 'Check the roles; set them with --roles if they are wrong.',
          roles: open.map((i) => (roles[i] ? formatRole(roles[i]!) : capture.channels[i]!.label)),
        },
      ),
    );
  }
}

/** The three channels whose sum is smallest relative to their size (Kirchhoff: E13 + E32 + E21 = 0). */
function kirchhoffTriple(capture: Capture, pool: readonly number[]): number[] | undefined {
  let best: number[] | undefined;
  let bestRatio = 0.02; // sum RMS below 2 % of the mean line RMS
  const step = Math.max(1, Math.floor(capture.sampleCount / 100_000));
  for (let a = 0; a < pool.length; a++)
    for (let b = a + 1; b < pool.length; b++)
      for (let c = b + 1; c < pool.length; c++) {
        const x = capture.channels[pool[a]!]!.samples;
        const y = capture.channels[pool[b]!]!.samples;
        const z = capture.channels[pool[c]!]!.samples;
        let sum2 = 0;
        let each2 = 0;
        let count = 0;
        for (let i = 0; i < capture.sampleCount; i += step) {
          const s = x[i]! + y[i]! + z[i]!;
          if (!Number.isFinite(s)) continue;
          sum2 += s * s;
          each2 += (x[i]! * x[i]! + y[i]! * y[i]! + z[i]! * z[i]!) / 3;
          count++;
        }
        if (count === 0 || each2 === 0) continue;
        const ratio = Math.sqrt(sum2 / each2);
        if (ratio < bestRatio) {
          bestRatio = ratio;
          best = [pool[a]!, pool[b]!, pool[c]!];
        }
      }
  return best;
}
