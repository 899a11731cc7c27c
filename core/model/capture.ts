/**
 * The in-memory form of one oscilloscope capture, after import.
 *
 * Samples are stored as Float32 (scopes resolve 8 to 16 bits; Float32 halves memory); every
 * computation on them is done in Float64.
 */
export interface CaptureChannel {
  /** Zero-based column index in the source file. */
  readonly column: number;
  /** Label as written in the file's header ("CH1", "S1-S3", ...), or a generated "CH<n>". */
  readonly label: string;
  /** Unit after scaling to SI base: always "V" for voltage columns ("" when the file gave none). */
  readonly unit: string;
  /** Samples in the unit above (values given in mV are scaled to V on import). */
  readonly samples: Float32Array;
}

export interface Capture {
  /** Sample rate in hertz, from the whole record (never from one time difference). */
  readonly sampleRateHz: number;
  /** Time of the first sample in seconds, as the file gives it (0 when it gives none). */
  readonly startS: number;
  /** Number of samples in every channel. */
  readonly sampleCount: number;
  readonly channels: readonly CaptureChannel[];
}
