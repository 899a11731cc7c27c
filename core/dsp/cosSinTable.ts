/**
 * cos(ω·(n − centre)) and sin(ω·(n − centre)) for consecutive sample indices, block by block.
 *
 * Each block's first angle is evaluated directly with Math.cos / Math.sin; the samples inside
 * the block use the angle-addition identities cos(α + β) = cos α cos β − sin α sin β and
 * sin(α + β) = sin α cos β + cos α sin β with β = ω·j from a table built once. Every value is
 * therefore a fixed number of roundings away from the exact one (a few ulp), with no error that
 * grows along the record, unlike a phase accumulator (`phi += ω`) or a rotator recurrence,
 * whose errors grow with n (IEEE Std 1057 sine-fit practice; the drift of accumulated phase
 * is common practice, no source). It needs 2 trig calls per block instead of 2 per sample.
 */
export const COS_SIN_BLOCK = 64;

export class CosSinBlocks {
  /** cos / sin of the current block, valid for the count given to {@link fill}. */
  readonly cos = new Float64Array(COS_SIN_BLOCK);
  readonly sin = new Float64Array(COS_SIN_BLOCK);
  private readonly cosStep = new Float64Array(COS_SIN_BLOCK);
  private readonly sinStep = new Float64Array(COS_SIN_BLOCK);

  /** @param omegaRadPerSample angular frequency ω in rad/sample; @param centre index where the angle is 0 (may be fractional). */
  private readonly omegaRadPerSample: number;
  private readonly centre: number;

  constructor(omegaRadPerSample: number, centre: number) {
    this.omegaRadPerSample = omegaRadPerSample;
    this.centre = centre;
    for (let j = 0; j < COS_SIN_BLOCK; j++) {
      this.cosStep[j] = Math.cos(omegaRadPerSample * j);
      this.sinStep[j] = Math.sin(omegaRadPerSample * j);
    }
  }

  /** Fills cos/sin for sample indices n0 … n0 + count − 1 (count ≤ COS_SIN_BLOCK). */
  fill(n0: number, count: number): void {
    const a = this.omegaRadPerSample * (n0 - this.centre);
    const ca = Math.cos(a);
    const sa = Math.sin(a);
    const c = this.cos;
    const s = this.sin;
    const cb = this.cosStep;
    const sb = this.sinStep;
    for (let j = 0; j < count; j++) {
      c[j] = ca * cb[j] - sa * sb[j];
      s[j] = sa * cb[j] + ca * sb[j];
    }
  }
}
