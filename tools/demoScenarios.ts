import type { CsvLayoutSpec } from '../core/synth/formatCaptureCsv.js';
import type { SynthSpec } from '../core/synth/synthesizeCapture.js';

/**
 * The demo captures shipped in sample-captures/synthetic: scenarios of our own, generated from
 * fixed seeds by tools/generateSamples.ts. The truth each was made from is written beside it.
 */
export interface DemoScenario {
  /** File stem in sample-captures/synthetic. */
  readonly name: string;
  /** One line for sample-captures/README.md: what the capture shows. */
  readonly shows: string;
  /** Named CSV layout (CSV_LAYOUTS) the file is written in, with any changes to it. */
  readonly layout: string;
  readonly layoutChanges?: Partial<CsvLayoutSpec>;
  readonly spec: SynthSpec;
  /** Finding codes the analysis must raise (others may appear only at info level). */
  readonly expectedFindings: readonly string[];
}

export const DEMO_SCENARIOS: readonly DemoScenario[] = [
  {
    name: 'wind-vane-slow-turn',
    shows:
      'A weather-station wind-vane transmitter (26 V / 11.8 V, 400 Hz synchro) swinging slowly through a gust: R1-R2 and all three stator lines, 12-bit scope, header plus a units row, values in mV.',
    layout: 'units-row',
    spec: {
      seed: 4101,
      sampleRateHz: 50_000,
      durationS: 1,
      carrier: { frequencyHz: 400.2, rmsV: 26, phaseDeg: 40 },
      units: [
        {
          kind: 'synchro',
          transformationRatio: 0.4538,
          phaseLeadDeg: 9.5,
          motion: {
            type: 'sum',
            parts: [
              { type: 'ramp', startDeg: 245, degPerS: 20 },
              { type: 'wobble', centreDeg: 0, amplitudeDeg: 1.5, frequencyHz: 0.7 },
            ],
          },
          lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }],
        },
      ],
      noiseV: 0.008,
      quantization: { bits: 12 },
    },
    expectedFindings: [],
  },
  {
    name: 'bench-resolver-dividing-head',
    shows:
      'A bench resolver (26 V, 400 Hz, 11.8 V windings) held at one stop of a dividing head (37.5°), excitation plus sine and cosine windings, exported by a scope set to a European locale: key/value preamble, semicolons, decimal commas.',
    layout: 'semicolon-decimal-comma',
    layoutChanges: { preamble: 'key-value' },
    spec: {
      seed: 4102,
      sampleRateHz: 40_000,
      durationS: 0.5,
      carrier: { frequencyHz: 400, rmsV: 26, phaseDeg: 0 },
      referenceLabel: 'REF',
      units: [
        {
          kind: 'resolver',
          transformationRatio: 0.4538,
          phaseLeadDeg: 4,
          motion: { type: 'static', deg: 37.5 },
          lines: [{ role: 'sin' }, { role: 'cos' }],
        },
      ],
      noiseV: 0.005,
      quantization: { bits: 12 },
    },
    expectedFindings: [],
  },
  {
    name: 'rudder-repeater-step',
    shows:
      'A ship rudder-angle transmitter (115 V / 90 V, 400 Hz) answering a 15° helm order with a damped swing, two stator lines measured against S2 (S1-S2, S3-S2), values in mV, no time column (sample interval in the preamble), 10-bit scope.',
    layout: 'preamble-no-time',
    layoutChanges: { valueUnit: 'mV' },
    spec: {
      seed: 4103,
      sampleRateHz: 40_000,
      durationS: 1.2,
      carrier: { frequencyHz: 400, rmsV: 115, phaseDeg: 75 },
      units: [
        {
          kind: 'synchro',
          transformationRatio: 0.7826,
          phaseLeadDeg: 6,
          motion: { type: 'step', fromDeg: 0, toDeg: 15, atS: 0.25, dampingRatio: 0.35, naturalHz: 2.5 },
          lines: [{ role: 's1s2' }, { role: 's3s2' }],
        },
      ],
      noiseV: 0.04,
      quantization: { bits: 10 },
    },
    expectedFindings: [],
  },
  {
    name: 'antenna-mount-no-reference',
    shows:
      'An antenna-mount azimuth synchro turning at 90°/s captured without the excitation: three stator lines only, tab-delimited, time in ms. The angle is then known only modulo 180°.',
    layout: 'tab-ms',
    spec: {
      seed: 4104,
      sampleRateHz: 50_000,
      durationS: 0.5,
      carrier: { frequencyHz: 399.7, rmsV: 26, phaseDeg: 10 },
      includeReference: false,
      units: [
        {
          kind: 'synchro',
          transformationRatio: 0.4538,
          phaseLeadDeg: 8,
          motion: { type: 'ramp', startDeg: 100, degPerS: 90 },
          lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }],
        },
      ],
      noiseV: 0.008,
      quantization: { bits: 12 },
    },
    expectedFindings: ['no-reference'],
  },
];
