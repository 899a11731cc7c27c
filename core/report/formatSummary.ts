import type { Analysis, UnitResult } from '../model/analysis.js';
import type { ReportMeta } from './analysisJson.js';

/** A short plain-text summary of an analysis, as the CLI prints it. */
export function formatSummary(analysis: Analysis, meta: ReportMeta): string {
  const { input, carrier } = analysis;
  const out: string[] = [];
  const durationS = input.samples / input.sampleRateHz;
  out.push(`${meta.file}`);
  out.push(
    `  capture    ${input.samples.toLocaleString('en-US')} samples at ${formatRate(input.sampleRateHz)} (${formatSeconds(durationS)}), ${input.channels.length} channels`,
  );
  out.push(
    `  channels   ${input.channels.map((c) => `${c.label} = ${c.role ?? 'unused'}`).join(', ')}`,
  );
  const fit = carrier.sineFitHz !== null ? `; sine fit ${carrier.sineFitHz.toFixed(4)} Hz` : '';
  const drift = Math.abs(carrier.endHz - carrier.startHz) >= 0.0005 ? ` (start ${carrier.startHz.toFixed(4)}, end ${carrier.endHz.toFixed(4)} Hz)` : '';
  out.push(
    `  carrier    ${carrier.frequencyHz.toFixed(4)} Hz${drift}${fit}; ${carrier.cycles} cycles, ${carrier.samplesPerCycle.toFixed(2)} samples/cycle`,
  );
  out.push(
    `  excitation ${carrier.referenceRmsV !== null ? `${carrier.referenceRmsV.toFixed(3)} V RMS (R1-R2)` : 'not captured: carrier taken from the stator lines'}`,
  );
  for (const unit of analysis.units) out.push(...formatUnit(unit, analysis.units.length > 1));
  if (analysis.findings.length === 0) {
    out.push('  findings   none');
  } else {
    out.push(`  findings   ${analysis.findings.length}`);
    for (const f of analysis.findings) {
      out.push(`    ${f.severity.padEnd(7)} ${f.code}: ${f.message}`);
      if (f.advice) out.push(`            ${f.advice}`);
    }
  }
  return `${out.join('\n')}\n`;
}

function formatUnit(unit: UnitResult, named: boolean): string[] {
  const out: string[] = [];
  const how = unit.method === 'three-lines' ? 'three lines' : unit.method === 'two-lines' ? 'two lines, third by Kirchhoff' : '';
  const tr = unit.transformationRatio !== null ? `transformation ratio ${unit.transformationRatio.toFixed(4)}` : 'transformation ratio n/a';
  const lead = unit.phaseLeadDeg !== null ? `phase lead ${unit.phaseLeadDeg.toFixed(2)}°` : 'phase lead n/a';
  out.push(`  unit       ${named ? `${unit.id}: ` : ''}${unit.kind}${how ? ` (${how})` : ''}; ${tr}, ${lead}`);
  for (const line of unit.lines) {
    out.push(
      `    ${line.role.padEnd(12)} max ${line.maxRmsV.toFixed(3).padStart(9)} V RMS   quadrature ${line.quadratureMv.toFixed(1).padStart(7)} mV`,
    );
  }
  const a = unit.angle;
  if (a && a.deg.length > 0) {
    const first = a.deg[0]!;
    const last = a.deg[a.deg.length - 1]!;
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of a.unwrappedDeg) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    const net = a.unwrappedDeg[a.unwrappedDeg.length - 1]! - a.unwrappedDeg[0]!;
    const dir = Math.abs(net) < 0.05 ? 'no net turn' : `net ${net > 0 ? '+' : ''}${net.toFixed(2)}° (${net > 0 ? 'CCW' : 'CW'})`;
    out.push(
      `  angle      ${first.toFixed(3)}° at ${a.t[0]!.toFixed(4)} s → ${last.toFixed(3)}° at ${a.t[a.t.length - 1]!.toFixed(4)} s; span ${(hi - lo).toFixed(2)}°, ${dir}${a.ambiguous180 ? '; known modulo 180°' : ''}`,
    );
  }
  return out;
}

function formatRate(hz: number): string {
  if (hz >= 1e6) return `${(hz / 1e6).toPrecision(6)} MS/s`;
  if (hz >= 1e3) return `${(hz / 1e3).toPrecision(6)} kS/s`;
  return `${hz.toPrecision(6)} S/s`;
}

function formatSeconds(s: number): string {
  return s >= 1 ? `${s.toFixed(3)} s` : `${(s * 1000).toFixed(3)} ms`;
}
