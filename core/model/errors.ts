import type { SourceLocation } from './findings.js';

/**
 * The input cannot be analysed at all (an empty file, no numeric columns, no carrier...).
 * Carries what went wrong, where, and what to do; the CLI prints `message` as one line.
 */
export class CaptureError extends Error {
  override readonly name = 'CaptureError';
  readonly at: SourceLocation | undefined;
  /** The message without the location. */
  readonly detail: string;

  constructor(message: string, at?: SourceLocation) {
    super(at ? `${message} (line ${at.line}${at.column !== undefined ? `, column ${at.column}` : ''})` : message);
    this.at = at;
    this.detail = message;
  }

  /** "file:line:column: detail", the form editors and terminals link to. */
  describeIn(file: string): string {
    if (!this.at) return `${file}: ${this.detail}`;
    return `${file}:${this.at.line}${this.at.column !== undefined ? `:${this.at.column}` : ''}: ${this.detail}`;
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
