/**
 * Recognises the unit words scopes write in a units row, a label suffix ("CH2 (mV)", "t[us]")
 * or a preamble ("Vertical Units,V"), and gives the factor to the SI base unit.
 *
 * SI prefixes per the SI Brochure (BIPM, 9th ed. 2019, Table 7); micro is accepted as `u`,
 * U+00B5 or U+03BC (common practice, no source).
 */
export type UnitQuantity = 'time' | 'voltage' | 'current';

export interface UnitToken {
  readonly quantity: UnitQuantity;
  /** The SI base unit symbol ("s", "V", "A"). */
  readonly baseUnit: string;
  /** Multiply a value in this unit by `factor` to get the base unit. */
  readonly factor: number;
  /** For time units, the layout's name; undefined for other quantities. */
  readonly timeUnit?: 's' | 'ms' | 'us';
}

const TIME: Record<string, UnitToken> = {
  s: { quantity: 'time', baseUnit: 's', factor: 1, timeUnit: 's' },
  ms: { quantity: 'time', baseUnit: 's', factor: 1e-3, timeUnit: 'ms' },
  us: { quantity: 'time', baseUnit: 's', factor: 1e-6, timeUnit: 'us' },
};

const TABLE: Record<string, UnitToken> = {
  s: TIME.s, sec: TIME.s, secs: TIME.s, second: TIME.s, seconds: TIME.s, Second: TIME.s, Seconds: TIME.s,
  ms: TIME.ms, msec: TIME.ms,
  us: TIME.us, 'µs': TIME.us, 'μs': TIME.us, usec: TIME.us,
  V: { quantity: 'voltage', baseUnit: 'V', factor: 1 },
  mV: { quantity: 'voltage', baseUnit: 'V', factor: 1e-3 },
  uV: { quantity: 'voltage', baseUnit: 'V', factor: 1e-6 },
  'µV': { quantity: 'voltage', baseUnit: 'V', factor: 1e-6 },
  'μV': { quantity: 'voltage', baseUnit: 'V', factor: 1e-6 },
  kV: { quantity: 'voltage', baseUnit: 'V', factor: 1e3 },
  A: { quantity: 'current', baseUnit: 'A', factor: 1 },
  mA: { quantity: 'current', baseUnit: 'A', factor: 1e-3 },
  uA: { quantity: 'current', baseUnit: 'A', factor: 1e-6 },
  'µA': { quantity: 'current', baseUnit: 'A', factor: 1e-6 },
};
const WORDS: Record<string, UnitToken> = {
  volt: TABLE.V, volts: TABLE.V, millivolt: TABLE.mV, millivolts: TABLE.mV, mvolt: TABLE.mV,
  mvolts: TABLE.mV, ampere: TABLE.A, amperes: TABLE.A, amps: TABLE.A,
  second: TIME.s, seconds: TIME.s, sec: TIME.s, millisecond: TIME.ms, milliseconds: TIME.ms,
  microsecond: TIME.us, microseconds: TIME.us,
};

/** Reads one unit word, with or without surrounding () or []; undefined when not recognised. */
export function readUnitToken(text: string): UnitToken | undefined {
  let s = text.trim();
  if ((s.startsWith('(') && s.endsWith(')')) || (s.startsWith('[') && s.endsWith(']'))) s = s.slice(1, -1).trim();
  if (s === '') return undefined;
  return TABLE[s] ?? WORDS[s.toLowerCase()];
}

/**
 * Splits a trailing bracketed unit off a label: "CH2 (mV)" -> {label "CH2", unit mV},
 * "t[us]" -> {label "t", unit us}. A bracketed word that is not a unit stays in the label.
 */
export function splitLabelUnit(label: string): { label: string; unit: UnitToken | undefined } {
  const m = /^(.*?)\s*[([]\s*([^()[\]]+?)\s*[)\]]\s*$/.exec(label);
  if (m) {
    const unit = readUnitToken(m[2]);
    if (unit) return { label: m[1].trim(), unit };
  }
  return { label, unit: undefined };
}
