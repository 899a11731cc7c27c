import { finding, type Finding } from '../model/findings.js';

/**
 * Swapped stator leads and a reversed rotor, from the decoded angle and what the user says the
 * shaft did.
 *
 * Rule (derived from the standard synchro equations E(S1−S3) = K·sin θ, E(S3−S2) = K·sin(θ+120°),
 * E(S2−S1) = K·sin(θ+240°); it reproduces NEETS Module 15 p.1-59, table 1-6, where a receiver
 * stands in for the analyser): whatever leads sit on the terminals, the decoded angle is
 * θ' = s·θ + c with s = ±1 and c a multiple of 60°:
 *   S1↔S3 swapped → θ' = −θ;  S1↔S2 → 240° − θ;  S2↔S3 → 120° − θ   (s = −1: turns the wrong way)
 *   leads rotated one place → θ + 120° or θ + 240°                      (s = +1)
 *   rotor R1/R2 reversed → add 180° to any of the above.
 * So the twelve wirings give twelve distinct (s, c) pairs: a stated start angle fixes c up to the
 * mirror, a stated direction fixes s, and both together name the wiring.
 */
export type LeadName = 's1' | 's2' | 's3';

export interface WiringHypothesis {
  /** Stable id, e.g. "as-labelled", "s1-s2-swapped", "leads-rotated-120", "rotor-reversed", "s1-s2-swapped+rotor-reversed". */
  readonly id: string;
  /** s in θ' = s·θ + c: −1 when the decoded angle turns the wrong way. */
  readonly sense: 1 | -1;
  /** c in θ' = s·θ + c, degrees in [0, 360). */
  readonly offsetDeg: number;
  /** The physical stator lead that sits on each labelled terminal. */
  readonly leadOnTerminal: Readonly<Record<LeadName, LeadName>>;
  readonly rotorReversed: boolean;
  /** Number of separate mistakes (a lead swap or rotation counts 1, the rotor 1). */
  readonly mistakes: number;
  /** The rule in words, e.g. "θ' = 240° − θ". */
  readonly rule: string;
  /** What to change to put it right. */
  readonly fix: string;
  /** Plain name, e.g. "S1 and S2 swapped". */
  readonly name: string;
}

const LEADS: readonly LeadName[] = ['s1', 's2', 's3'];
const PERMUTATIONS: readonly (readonly [number, number, number])[] = [
  [0, 1, 2], [1, 0, 2], [2, 1, 0], [0, 2, 1], [2, 0, 1], [1, 2, 0],
];

/**
 * Decoded angle (degrees) when the terminals labelled S1, S2, S3 carry the physical leads
 * `perm[0..2]` of a unit at electrical angle `trueDeg`, with the rotor reversed or not: the
 * standard equations through the lead potentials V1 = (A−C)/3, V2 = (C−B)/3, V3 = (B−A)/3
 * (zero-sum potentials of the Y stator; derived), then θ' = atan2(A', (B' − C')/√3).
 */
export function decodeMiswiredDeg(trueDeg: number, perm: readonly [number, number, number], rotorReversed: boolean): number {
  const t = (trueDeg * Math.PI) / 180;
  const a = Math.sin(t), b = Math.sin(t + (2 * Math.PI) / 3), c = Math.sin(t + (4 * Math.PI) / 3);
  const v = [(a - c) / 3, (c - b) / 3, (b - a) / 3];
  const r = rotorReversed ? -1 : 1;
  const p1 = r * v[perm[0]]!, p2 = r * v[perm[1]]!, p3 = r * v[perm[2]]!;
  const a2 = p1 - p3, b2 = p3 - p2, c2 = p2 - p1;
  return wrap((Math.atan2(a2, (b2 - c2) / Math.sqrt(3)) * 180) / Math.PI);
}

function wrap(d: number): number {
  const r = d % 360;
  const w = r < 0 ? r + 360 : r;
  return Math.abs(w - 360) < 1e-9 ? 0 : w;
}

function diff(a: number, b: number): number {
  return ((a - b + 540) % 360) - 180;
}

function buildHypotheses(): WiringHypothesis[] {
  const out: WiringHypothesis[] = [];
  for (const rotorReversed of [false, true]) {
    for (const perm of PERMUTATIONS) {
      const c = Math.round(decodeMiswiredDeg(0, perm, rotorReversed) * 1e6) / 1e6;
      const at90 = decodeMiswiredDeg(90, perm, rotorReversed);
      const sense: 1 | -1 = Math.abs(diff(at90, c) - 90) < 1e-6 ? 1 : -1;
      const moved = [0, 1, 2].filter((i) => perm[i] !== i);
      const leadOnTerminal = { s1: LEADS[perm[0]]!, s2: LEADS[perm[1]]!, s3: LEADS[perm[2]]! };
      let statorId = '';
      let statorName = '';
      let statorFix = '';
      if (moved.length === 2) {
        const [x, y] = moved.map((i) => LEADS[i]!) as [LeadName, LeadName];
        statorId = `${x}-${y}-swapped`;
        statorName = `${x.toUpperCase()} and ${y.toUpperCase()} swapped`;
        statorFix = `exchange the leads on terminals ${x.toUpperCase()} and ${y.toUpperCase()}`;
      } else if (moved.length === 3) {
        statorId = `leads-rotated-${rotorReversed ? wrap(c + 180) : c}`;
        statorName = `stator leads rotated one place (${LEADS.map((l, i) => `${LEADS[perm[i]!]!.toUpperCase()} on ${l.toUpperCase()}`).join(', ')})`;
        statorFix = `move each lead to its own terminal (${LEADS.map((l, i) => `the lead on ${l.toUpperCase()} is ${LEADS[perm[i]!]!.toUpperCase()}`).join(', ')})`;
      }
      const ids = [statorId, rotorReversed ? 'rotor-reversed' : ''].filter(Boolean);
      const names = [statorName, rotorReversed ? 'rotor R1/R2 reversed' : ''].filter(Boolean);
      const fixes = [statorFix, rotorReversed ? 'exchange R1 and R2 (at the unit or at the reference probe)' : ''].filter(Boolean);
      const rule = sense === 1 ? (c === 0 ? 'θ\' = θ' : `θ' = θ + ${c}°`) : c === 0 ? "θ' = −θ" : `θ' = ${c}° − θ`;
      out.push({
        id: ids.length ? ids.join('+') : 'as-labelled',
        sense,
        offsetDeg: c,
        leadOnTerminal,
        rotorReversed,
        mistakes: ids.length,
        rule,
        fix: fixes.length ? fixes.join(', and ') : 'nothing',
        name: names.length ? names.join(', with the ') : 'wired as labelled',
      });
    }
  }
  return out;
}

/** The twelve wirings (six lead orders × rotor as labelled or reversed), simplest first. */
export const WIRING_HYPOTHESES: readonly WiringHypothesis[] = buildHypotheses().sort((a, b) => a.mistakes - b.mistakes);

/** The true angle from a decoded one under a wiring hypothesis: θ = s·(θ' − c). */
export function undoWiringDeg(h: WiringHypothesis, decodedDeg: number): number {
  return wrap(h.sense * (decodedDeg - h.offsetDeg));
}

/** What the user says the shaft did during the capture. */
export interface ShaftStatement {
  /** The shaft's true electrical angle at the start of the record, degrees (0 = set at electrical zero). */
  readonly startDeg?: number;
  /** Shorthand for startDeg = 0. */
  readonly atZero?: boolean;
  /** Which way the shaft was turned, viewed from the shaft end (counter-clockwise = positive). */
  readonly turned?: 'ccw' | 'cw';
}

export interface ShaftFactsOptions {
  /** How far the decoded start may lie from a hypothesis' prediction, degrees (default 15; hypotheses are 60° apart). */
  readonly startToleranceDeg?: number;
  /** Least net travel that counts as a turn, degrees (default 5). */
  readonly minTurnDeg?: number;
  readonly roles?: readonly string[];
}

export interface ShaftFacts {
  /** Decoded angle at the start (circular mean of the first cycles), degrees. */
  readonly observedStartDeg: number;
  /** Net decoded travel over the record (unwrapped, end minus start), degrees. */
  readonly observedTravelDeg: number;
  /** The wirings consistent with the trace and the statement, simplest first. */
  readonly consistent: readonly WiringHypothesis[];
  readonly findings: readonly Finding[];
}

/**
 * Lists the wirings consistent with a decoded angle trace and the user's statement, and reports
 * the likely one when it is not "as labelled". `deg` and `unwrappedDeg` are the per-cycle
 * decoded angle (wrapped and unwrapped), as the angle solver returns them.
 */
export function checkShaftFacts(
  trace: { readonly deg: ArrayLike<number>; readonly unwrappedDeg: ArrayLike<number> },
  statement: ShaftStatement,
  options: ShaftFactsOptions = {},
): ShaftFacts {
  const n = trace.deg.length;
  const tol = options.startToleranceDeg ?? 15;
  const minTurn = options.minTurnDeg ?? 5;
  const roles = options.roles ?? [];
  const startDeg = statement.startDeg ?? (statement.atZero ? 0 : undefined);
  if (n === 0) return { observedStartDeg: NaN, observedTravelDeg: NaN, consistent: [], findings: [] };
  const edge = Math.max(1, Math.min(8, Math.floor(n / 4)));
  let cs = 0, sn = 0, first = 0, last = 0;
  for (let m = 0; m < edge; m++) {
    cs += Math.cos((trace.deg[m]! * Math.PI) / 180);
    sn += Math.sin((trace.deg[m]! * Math.PI) / 180);
    first += trace.unwrappedDeg[m]!;
    last += trace.unwrappedDeg[n - 1 - m]!;
  }
  const observedStartDeg = wrap((Math.atan2(sn, cs) * 180) / Math.PI);
  const observedTravelDeg = (last - first) / edge;
  const observedSense = Math.abs(observedTravelDeg) >= minTurn ? Math.sign(observedTravelDeg) : 0;
  const statedSense = statement.turned === 'ccw' ? 1 : statement.turned === 'cw' ? -1 : 0;
  const findings: Finding[] = [];
  const figures = { observedStartDeg, observedTravelDeg, ...(startDeg !== undefined ? { statedStartDeg: startDeg } : {}) };

  if (startDeg === undefined && statedSense === 0) return { observedStartDeg, observedTravelDeg, consistent: [...WIRING_HYPOTHESES], findings };
  const senseKnown = statedSense !== 0 && observedSense !== 0;
  if (statedSense !== 0 && observedSense === 0) {
    findings.push(
      finding('shaft-facts-unchecked', 'info', `The shaft is said to have turned ${statement.turned === 'ccw' ? 'counter-clockwise' : 'clockwise'}, but the decoded angle moved only ${observedTravelDeg.toFixed(1)}° over the record.`, {
        advice: `The direction cannot be checked from this capture; turn the shaft by at least ${minTurn}° during the record to tell a swapped pair of leads from a rotation.`,
        roles,
        figures,
      }),
    );
  }
  const consistent = WIRING_HYPOTHESES.filter((h) => {
    if (senseKnown && h.sense * statedSense !== observedSense) return false;
    if (startDeg !== undefined && Math.abs(diff(observedStartDeg, wrap(h.sense * startDeg + h.offsetDeg))) > tol) return false;
    return true;
  });
  const said = [
    startDeg !== undefined ? `the shaft stated at ${startDeg.toFixed(0)}°` : '',
    statedSense !== 0 ? `turned ${statement.turned === 'ccw' ? 'counter-clockwise' : 'clockwise'}` : '',
  ].filter(Boolean).join(' and ');
  const seen = `the decoded angle starts at ${observedStartDeg.toFixed(1)}°${observedSense !== 0 ? ` and runs ${observedSense > 0 ? 'counter-clockwise' : 'clockwise'} (${observedTravelDeg > 0 ? '+' : ''}${observedTravelDeg.toFixed(1)}° over the record)` : ''}`;

  if (consistent.length === 0) {
    // No wiring explains it: an offset that is not a multiple of 60° means the unit is not zeroed.
    // It is measured from the simplest wiring that turns the observed way.
    const candidates = WIRING_HYPOTHESES.filter((h) => !senseKnown || h.sense * statedSense === observedSense);
    let nearest = candidates[0]!;
    let nearestOff = Infinity;
    for (const h of candidates) {
      const off = diff(observedStartDeg, wrap(h.sense * (startDeg ?? 0) + h.offsetDeg));
      // Fewest mistakes first (the list is sorted so), then the smallest offset.
      if (h.mistakes === candidates[0]!.mistakes && Math.abs(off) < Math.abs(nearestOff) - 1e-9) {
        nearest = h;
        nearestOff = off;
      }
    }
    findings.push(
      finding('zero-offset', 'warning', `With ${said}, ${seen}: no wiring mistake explains an offset of ${nearestOff.toFixed(1)}°.`, {
        advice:
          nearest.id === 'as-labelled'
            ? 'The unit (or the shaft coupling) is probably not on electrical zero (NEETS Module 15 p.1-57: a constant offset with correct direction means wrong zeroing); re-zero it, or check the stated start angle.'
            : `The nearest wiring is ${nearest.name} (${nearest.rule}), ${nearestOff.toFixed(1)}° off: the unit is probably also off electrical zero; check the stated start angle and the zeroing.`,
        roles,
        figures: { ...figures, offsetDeg: nearestOff },
      }),
    );
    return { observedStartDeg, observedTravelDeg, consistent, findings };
  }
  if (consistent.some((h) => h.id === 'as-labelled')) return { observedStartDeg, observedTravelDeg, consistent, findings };

  const best = consistent[0]!;
  const rest = consistent.slice(1).filter((h) => h.mistakes === best.mistakes);
  const more = consistent.slice(1).filter((h) => h.mistakes > best.mistakes);
  const code = best.id === 'rotor-reversed' ? 'rotor-reversed' : 'wiring-swapped';
  const alsoText =
    rest.length > 0
      ? ` Equally simple: ${rest.map((h) => `${h.name} (${h.rule})`).join('; ')}; ${statedSense === 0 ? 'stating the direction the shaft turned' : startDeg === undefined ? 'stating the start angle' : 'a second capture'} would tell them apart.`
      : '';
  const moreText = more.length > 0 ? ` Less likely: ${more.map((h) => h.name).join('; ')}.` : '';
  findings.push(
    finding(code, 'warning', `With ${said}, ${seen}.`, {
      advice: `This is what ${best.name} gives (${best.rule}; NEETS Module 15 p.1-59, table 1-6); to fix it, ${best.fix}, or relabel the channels.${alsoText}${moreText}`,
      roles,
      figures: { ...figures, likelyOffsetDeg: best.offsetDeg, likelySense: best.sense },
    }),
  );
  return { observedStartDeg, observedTravelDeg, consistent, findings };
}
