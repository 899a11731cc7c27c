import { parseNumberText } from './parseNumberText.js';
import { readUnitToken, type UnitToken } from './readUnitToken.js';

/**
 * Reads the key/value lines some scopes write before the header ("Sample Interval,1.0E-05",
 * "Record Length,100000", "Vertical Units,V"). Keys are matched case-insensitively, ignoring
 * blanks, '_' and '-', a trailing ':' and a bracketed unit ("Sample Interval (us)"). The key
 * spellings are the common ones of scope exports (common practice, no source).
 */
export interface PreambleEntry {
  readonly key: string;
  readonly value: string;
  readonly line: number;
}

export interface PreambleFacts {
  intervalS?: number;
  intervalLine?: number;
  rateHz?: number;
  rateLine?: number;
  recordLength?: number;
  verticalUnit?: UnitToken;
  horizontalUnit?: UnitToken;
  startS?: number;
}

type KeyRole = 'interval' | 'rate' | 'length' | 'vertical' | 'horizontal' | 'start';

const KEYS: Record<string, KeyRole> = {};
const add = (role: KeyRole, ...names: string[]): void => {
  for (const n of names) KEYS[n.replace(/[\s_-]+/g, '')] = role;
};
add('interval', 'sample interval', 'sampling interval', 'sample period', 'sampling period', 'x increment',
  'xincr', 'time per point', 'dt', 'delta t', 'time interval', 'horizontal interval', 'time step', 'sample time');
add('rate', 'sample rate', 'sampling rate', 'sample frequency', 'sampling frequency', 'fs', 'samples per second');
add('length', 'record length', 'points', 'number of points', 'record points', 'data points', 'num points',
  'npoints', 'point count', 'number of samples', 'memory length');
add('vertical', 'vertical units', 'vertical unit', 'units', 'unit', 'y units', 'y unit', 'vertical scale units');
add('horizontal', 'horizontal units', 'horizontal unit', 'x units', 'x unit', 'time units', 'time unit');
add('start', 'start time', 'x origin', 'x zero', 'x start', 'first point time', 't0');

function normaliseKey(key: string): { name: string; unit: UnitToken | undefined } {
  let k = key.trim().replace(/^[#%]+/, '').replace(/:$/, '').trim();
  let unit: UnitToken | undefined;
  const m = /^(.*?)\s*[([]\s*([^()[\]]+?)\s*[)\]]$/.exec(k);
  if (m) {
    unit = readUnitToken(m[2]);
    k = m[1];
  }
  return { name: k.toLowerCase().replace(/[\s_-]+/g, ''), unit };
}

export function isKnownPreambleKey(key: string): boolean {
  return KEYS[normaliseKey(key).name] !== undefined;
}

const RATE_SUFFIX: Record<string, number> = {
  hz: 1, khz: 1e3, mhz: 1e6, ghz: 1e9,
  's/s': 1, 'sa/s': 1, 'ks/s': 1e3, 'ksa/s': 1e3, 'ms/s': 1e6, 'msa/s': 1e6, 'gs/s': 1e9, 'gsa/s': 1e9,
  sps: 1, ksps: 1e3, msps: 1e6, gsps: 1e9,
};

/** A number possibly followed by a unit word: "1.0E-05", "10 us", "2,5E-6 s", "1 MSa/s". */
function splitValue(value: string, decimalMark: '.' | ','): { number: number; suffix: string } | undefined {
  const s = value.trim();
  const m = /^(\S+?)\s*([A-Za-zµμ/%]*)$/.exec(s);
  if (!m) return undefined;
  // Preamble values may use either mark (under a ',' delimiter a comma never reaches here).
  for (const mark of decimalMark === ',' ? [',', '.'] as const : ['.', ','] as const) {
    const v = parseNumberText(m[1], mark);
    if (v.kind === 'number') return { number: v.value, suffix: m[2] };
  }
  return undefined;
}

export function readPreamble(entries: readonly PreambleEntry[], decimalMark: '.' | ','): PreambleFacts {
  const facts: PreambleFacts = {};
  for (const e of entries) {
    const { name, unit: keyUnit } = normaliseKey(e.key);
    const role = KEYS[name];
    if (role === undefined) continue;
    if (role === 'vertical' || role === 'horizontal') {
      const u = readUnitToken(e.value);
      if (u && role === 'vertical' && u.quantity !== 'time') facts.verticalUnit = u;
      if (u && role === 'horizontal' && u.quantity === 'time') facts.horizontalUnit = u;
      continue;
    }
    const v = splitValue(e.value, decimalMark);
    if (!v || !Number.isFinite(v.number)) continue;
    if (role === 'length') {
      if (v.number > 0 && Number.isInteger(v.number)) facts.recordLength = v.number;
    } else if (role === 'rate') {
      const factor = v.suffix === '' ? 1 : RATE_SUFFIX[v.suffix.toLowerCase()];
      if (factor !== undefined && v.number > 0) {
        facts.rateHz = v.number * factor;
        facts.rateLine = e.line;
      }
    } else {
      const u = v.suffix === '' ? keyUnit : readUnitToken(v.suffix);
      if (v.suffix !== '' && (u === undefined || u.quantity !== 'time')) continue;
      const seconds = v.number * (u?.factor ?? 1);
      if (role === 'interval') {
        if (seconds > 0) {
          facts.intervalS = seconds;
          facts.intervalLine = e.line;
        }
      } else facts.startS = seconds;
    }
  }
  return facts;
}
