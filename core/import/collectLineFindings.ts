import { finding, type Finding, type Severity, type SourceLocation } from '../model/findings.js';

/**
 * Collects per-line findings with a cap, so a file with a million bad cells yields a handful of
 * findings plus one total per code instead of a million objects.
 */
export class LineFindingCollector {
  private readonly listed: Finding[] = [];
  private readonly counts = new Map<string, { count: number; severity: Severity; firstLine: number; noun: string }>();

  readonly perCodeLimit: number;

  constructor(perCodeLimit = 5) {
    this.perCodeLimit = perCodeLimit;
  }

  /** True when another finding of this code would still be listed (callers skip building text otherwise). */
  wouldList(code: string): boolean {
    const c = this.counts.get(code);
    return c === undefined || c.count < this.perCodeLimit;
  }

  /**
   * Counts one occurrence; lists it while under the cap. `make` builds the message lazily.
   * `noun` names the occurrences in the total ("cells", "rows", "time stamps").
   */
  add(code: string, severity: Severity, at: SourceLocation, noun: string, make: () => { message: string; advice?: string; figures?: Record<string, number>; roles?: string[] }): void {
    let c = this.counts.get(code);
    if (c === undefined) {
      c = { count: 0, severity, firstLine: at.line, noun };
      this.counts.set(code, c);
    }
    c.count++;
    if (c.count <= this.perCodeLimit) {
      const m = make();
      this.listed.push(finding(code, severity, m.message, { ...m, at }));
    }
  }

  count(code: string): number {
    return this.counts.get(code)?.count ?? 0;
  }

  /** The listed findings plus one total per code whose count passed the cap. */
  result(): Finding[] {
    const out = [...this.listed];
    for (const [code, c] of this.counts) {
      if (c.count > this.perCodeLimit) {
        out.push(finding(code, c.severity, `${c.count} ${c.noun} in all (the first ${this.perCodeLimit} are listed; the first is at line ${c.firstLine}).`, {
          figures: { count: c.count, firstLine: c.firstLine },
          at: { line: c.firstLine },
        }));
      }
    }
    return out;
  }
}
