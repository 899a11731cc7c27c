import type { RoleOptions } from '../roles/assignRoles.js';

/** What the user can tell the analysis beyond the capture itself (all optional). */
export interface AnalyzeOptions extends RoleOptions {
  /** Two-speed sets: fine turns per coarse turn (detected when omitted). */
  readonly speedRatio?: number;
  /** Two-speed sets: deliberate stick-off rotation of the coarse unit, degrees. */
  readonly stickOffDeg?: number;
  /** What the shaft did during the capture, to expose swapped leads or a reversed rotor. */
  readonly shaftFacts?: { readonly atElectricalZero?: boolean; readonly turned?: 'ccw' | 'cw' };
  /** Stepped accuracy runs: accuracy class ±N′, the step between stops, or the list of stops. */
  readonly accuracy?: { readonly classArcmin?: number; readonly stepDeg?: number; readonly nominalDeg?: readonly number[] };
  /** Null-voltage limit, mV RMS ("report, don't judge" when omitted). */
  readonly nullLimitMv?: number;
  /** Tolerance for matching a standard transformation ratio, percent. */
  readonly ratioTolerancePct?: number;
  /** Control-transformer error gradient, V per degree. */
  readonly ctGradientVPerDeg?: number;
}
