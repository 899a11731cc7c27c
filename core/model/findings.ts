/**
 * Findings: what the analysis saw in the data, in plain words, with the figures behind it.
 * Bad data never throws; it becomes a finding. Unusable data becomes one `CaptureError`.
 */
export type Severity = 'info' | 'warning' | 'error';

/** Where in the source file a finding points, 1-based like an editor shows it. */
export interface SourceLocation {
  readonly line: number;
  readonly column?: number;
}

export interface Finding {
  /** Stable kebab-case code, e.g. "no-reference" (the vocabulary in DEVELOPERS.md; never renamed). */
  readonly code: string;
  readonly severity: Severity;
  /** One plain sentence: what was seen. */
  readonly message: string;
  /** One plain sentence: what it likely means and what to check (optional). */
  readonly advice?: string;
  /** Channel roles (or labels when no role is known) the finding concerns. */
  readonly roles: readonly string[];
  /** The numbers behind the statement, in the units their names state. */
  readonly figures?: Readonly<Record<string, number>>;
  /** Location in the source file, when the finding points at one. */
  readonly at?: SourceLocation;
}

/** Builds a finding; keeps call sites short and the field order stable. */
export function finding(
  code: string,
  severity: Severity,
  message: string,
  extra: {
    advice?: string;
    roles?: readonly string[];
    figures?: Record<string, number>;
    at?: SourceLocation;
  } = {},
): Finding {
  return {
    code,
    severity,
    message,
    roles: extra.roles ?? [],
    ...(extra.advice !== undefined ? { advice: extra.advice } : {}),
    ...(extra.figures !== undefined ? { figures: extra.figures } : {}),
    ...(extra.at !== undefined ? { at: extra.at } : {}),
  };
}
