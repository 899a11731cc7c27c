import { readFileSync } from 'node:fs';
import Ajv from 'ajv';
import { describe, expect, it } from 'vitest';
import { analyzeCapture } from '../../../core/pipeline.js';
import { analysisToJson } from '../../../core/report/analysisJson.js';
import { anglesToCsv } from '../../../core/report/anglesCsv.js';
import { formatSummary } from '../../../core/report/formatSummary.js';
import { renderHtmlReport } from '../../../core/report/htmlReport.js';
import { synthesizeCapture, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';

// The JSON contract (schema statorscope.analysis/1) is checked with ajv, a general-purpose JSON
// Schema validator, against the committed schema file that states the contract's fields.
const schema = JSON.parse(readFileSync('schema/statorscope.analysis-1.schema.json', 'utf8'));
const validate = new Ajv({ allErrors: true, strict: false }).compile(schema);
const meta = { file: 'test.csv', version: '0.0.0' };

const lines = [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }];
const base = (over: Partial<SynthSpec>): SynthSpec => ({
  seed: 12,
  sampleRateHz: 40_000,
  durationS: 1,
  carrier: { frequencyHz: 400, rmsV: 26 },
  units: [{ kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'static', deg: 30 }, lines }],
  noiseV: 0.005,
  quantization: { bits: 12 },
  ...over,
});

const captures: Record<string, SynthSpec> = {
  'static synchro': base({}),
  'damped step': base({ durationS: 1.6, units: [{ kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'step', fromDeg: 10, toDeg: 40, atS: 0.3, dampingRatio: 0.3, naturalHz: 4 }, lines }] }),
  'no reference, turning': base({ includeReference: false, units: [{ kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 0, degPerS: 400 }, lines }] }),
  'two-speed set': base({
    units: [
      { id: 'coarse', kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 5, degPerS: 20 }, lines },
      { id: 'fine', kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, speed: 36, motion: { type: 'ramp', startDeg: 5, degPerS: 20 }, lines },
    ],
  }),
};

function analyse(spec: SynthSpec) {
  const syn = synthesizeCapture(spec);
  const overrides = spec.units.length > 1 ? Object.fromEntries(syn.roles.map((r, i) => [r, `ch${i + 1}`])) : undefined;
  return analyzeCapture(syn.capture, overrides ? { overrides } : {});
}

describe('analysisToJson(analysis, meta)', () => {
  for (const [name, spec] of Object.entries(captures)) {
    it(`${name}: the JSON validates against the statorscope.analysis/1 schema`, () => {
      const json = JSON.parse(JSON.stringify(analysisToJson(analyse(spec), meta)));
      const ok = validate(json);
      expect(validate.errors ?? []).toEqual([]);
      expect(ok).toBe(true);
      // Typed arrays must come out as arrays, never as {"0": ..} objects.
      expect(Array.isArray(json.angle.t)).toBe(true);
      expect(JSON.stringify(json)).not.toMatch(/"0":/);
    });
  }

  it('the schema check can fail: a JSON without lines or with a bad severity is rejected', () => {
    const json = JSON.parse(JSON.stringify(analysisToJson(analyse(captures['static synchro']!), meta)));
    delete json.units[0].lines;
    expect(validate(json)).toBe(false);
    const json2 = JSON.parse(JSON.stringify(analysisToJson(analyse(captures['no reference, turning']!), meta)));
    json2.findings[0].severity = 'fatal';
    expect(validate(json2)).toBe(false);
  });

  it('a two-speed set: combined angle, coarse error, and both units in the summary, CSV and report', () => {
    const analysis = analyse(captures['two-speed set']!);
    expect(analysis.twoSpeed!.speedRatio).toBe(36);
    const csv = anglesToCsv(analysis).split('\n')[0]!;
    expect(csv).toBe('t_s,coarse_angle_deg,coarse_unwrapped_deg,fine_angle_deg,fine_unwrapped_deg,combined_angle_deg,combined_unwrapped_deg,coarse_error_deg,velocity_deg_per_s');
    expect(formatSummary(analysis, meta)).toMatch(/two-speed\s+coarse\/fine, ratio 36 \(detected\)/);
    const html = renderHtmlReport(analysis, meta);
    expect(html).toMatch(/<svg/);
    expect(html).toMatch(/Caution/);
  });

  it('a damped step appears in the summary and the report with its figures', () => {
    const analysis = analyse(captures['damped step']!);
    expect(formatSummary(analysis, meta)).toMatch(/step\s+0\.3\d\d s: 10\.0\d° → 40\.0\d° \(\+30\.0\d°\), overshoot 37\.\d %/);
    expect(renderHtmlReport(analysis, meta)).toMatch(/<h2>Steps<\/h2>/);
  });
});
