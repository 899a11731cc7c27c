import type { SourceLocation } from './findings.js';

/**
 * The input cannot be analysed at all (an empty file, no numeric columns, no carrier...).
 * Carries what went wrong, where, and what to do; the CLI prints `message` as one line.
 */
export class CaptureError extends Error {
  override readonly name = 'CaptureError';
  readonly at: SourceLocation | undefined;

  constructor(message: string, at?: SourceLocation) {
    super(at ? `${message} (line ${at.line}${at.column !== undefined ? `, column ${at.column}` : ''})` : message);
    this.at = at;
  }
}

/** A broken internal invariant: a bug in Statorscope, never a property of the data. */
export class InvariantError extends Error {
  override readonly name = 'InvariantError';
}

/** A caller passed an argument outside its documented domain. */
export function assertArgument(condition: boolean, message: string): asserts condition {
  if (!condition) throw new RangeError(message);
}
