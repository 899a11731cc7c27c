import { wrapDeg } from '../angle/unwrapDeg.js';
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
  out.push(...formatCombined(analysis));
  out.push(...formatMotion(analysis));
  out.push(...formatAccuracy(analysis));
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
  if (unit.family) {
    out.push(`    matches the ${unit.family.name} family (nominal ratio ${unit.family.nominalRatio.toFixed(4)}, ${signed(unit.family.deviationPct, 2)} %)`);
  }
  for (const r of unit.repairs) {
    out.push(
      r.action === 'dropped'
        ? `    repaired   ${r.base} left out (dead); the angle is solved from the other two lines`
        : `    repaired   ${r.base} divided by ${fmtFactor(r.dividedBy)} before solving the angle`,
    );
  }
  if (!unit.angleValid && unit.angle) out.push('    the wiring faults above leave this angle meaningless; it is shown for diagnosis only');
  for (const n of unit.nulls) {
    out.push(
      `    null       ${n.role} at ${n.angleDeg.toFixed(0)}° (${n.tS.toFixed(3)} s): in-phase ${n.inPhaseMv.toFixed(1)} mV, quadrature ${n.quadratureMv.toFixed(1)} mV, harmonics ${n.harmonicMv.toFixed(1)} mV, total ${n.totalMv.toFixed(1)} mV RMS`,
    );
  }
  const plane = unit.plane;
  if (plane && plane.identifiable) {
    out.push(
      `    plane      offsets sin ${signed(plane.sinOffsetPct, 3)} % cos ${signed(plane.cosOffsetPct, 3)} %, gain mismatch ${signed(plane.gainMismatchPct, 3)} %, non-orthogonality ${signed(plane.nonOrthogonalityDeg, 3)}°; predicted error: 1st harmonic ${plane.predicted.firstHarmonicArcmin.toFixed(2)}′, 2nd ${plane.predicted.secondHarmonicArcmin.toFixed(2)}′`,
    );
  }
  const ct = unit.ctError;
  if (ct) {
    const crossings = ct.nullCrossings.map((c) => `${c.tS.toFixed(3)} s`).join(', ');
    out.push(
      `    CT error   gradient ${ct.gradientVPerDeg.toFixed(3)} V/° (${ct.gradientSource}); ${ct.nullCrossings.length} null crossing${ct.nullCrossings.length === 1 ? '' : 's'}${crossings ? ` at ${crossings}` : ''}`,
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
      `  angle      ${degText(first, 3)}° at ${a.t[0]!.toFixed(4)} s → ${degText(last, 3)}° at ${a.t[a.t.length - 1]!.toFixed(4)} s; span ${(hi - lo).toFixed(2)}°, ${dir}${a.ambiguous180 ? '; known modulo 180°' : ''}`,
    );
  }
  return out;
}

function formatCombined(analysis: Analysis): string[] {
  const out: string[] = [];
  const ts = analysis.twoSpeed;
  if (ts) {
    out.push(
      `  two-speed  ${ts.coarseId}/${ts.fineId}, ratio ${ts.speedRatio} (${ts.speedRatioSource}); worst coarse error ${ts.worstCoarseErrorDeg.toFixed(3)}° (limit ±${ts.limitDeg.toFixed(2)}°), ${ts.ambiguousCycles} ambiguous cycles`,
    );
  }
  const tr = analysis.tracking;
  if (tr) out.push(`  tracking   ${tr.b} follows ${tr.a}: mean ${signed(tr.meanArcmin, 2)}′, RMS ${tr.rmsArcmin.toFixed(2)}′, max ${tr.maxAbsArcmin.toFixed(2)}′`);
  return out;
}

function formatMotion(analysis: Analysis): string[] {
  const m = analysis.motion;
  if (!m) return [];
  const count = (kind: string): number => m.segments.filter((s) => s.kind === kind).length;
  const out = [`  motion     ${count('stationary')} stationary, ${count('moving')} moving, ${count('ramp')} constant-speed segments`];
  const j = m.jitter;
  if (j) {
    const tones = j.dominantHz.length ? `; tones ${j.dominantHz.map((f) => `${f.toFixed(2)} Hz`).join(', ')}` : '';
    out.push(`  jitter     ${j.rmsArcmin.toFixed(2)}′ RMS, ${j.ppArcmin.toFixed(2)}′ p-p (${j.source})${tones}`);
  }
  for (const s of m.steps) {
    const damping = s.dampingRatio !== null && s.naturalHz !== null ? `, ζ ${s.dampingRatio.toFixed(3)}, fn ${s.naturalHz.toFixed(2)} Hz (${s.dampingSource})` : '';
    out.push(
      `  step       ${s.tS.toFixed(3)} s: ${degText(s.fromDeg, 2)}° → ${degText(s.toDeg, 2)}° (${signed(s.sizeDeg, 2)}°), overshoot ${s.overshootPct.toFixed(1)} %, settling ${s.settlingS !== null ? `${s.settlingS.toFixed(3)} s` : 'not reached'} (±${s.settlingBandPct} %)${damping}`,
    );
  }
  return out;
}

function formatAccuracy(analysis: Analysis): string[] {
  const acc = analysis.accuracy;
  if (!acc) return [];
  const harmonics = acc.harmonics
    .filter((h) => h.order > 0)
    .slice(0, 4)
    .map((h) => `H${h.order} ${h.amplitudeArcmin.toFixed(2)}′`)
    .join(', ');
  if (acc.mode === 'stepped') {
    const verdict = acc.pass === null ? '' : `; class ±${acc.classArcmin}′: ${acc.pass ? 'pass' : `FAIL at ${acc.failingNominalDeg.map((d) => `${d}°`).join(', ')}`}`;
    const oneCycle = acc.oneCycleErrorArcmin !== null ? `, 1-cycle ${signed(acc.oneCycleErrorArcmin, 2)}′` : '';
    return [
      `  accuracy   stepped run, ${acc.positions.length} stops of ${acc.incrementDeg}°: index error ${signed(acc.indexErrorArcmin, 2)}′, spread ${acc.ppArcmin.toFixed(2)}′ p-p, max |error| ${acc.maxAbsArcmin.toFixed(2)}′${oneCycle}${harmonics ? `; ${harmonics}` : ''}${verdict}`,
    ];
  }
  return [
    `  accuracy   constant-speed run at ${acc.speedDegPerS.toFixed(2)}°/s over ${acc.turns.toFixed(2)} turns: spread ${acc.ppArcmin.toFixed(2)}′ p-p, RMS ${acc.rmsArcmin.toFixed(2)}′${harmonics ? `; ${harmonics}` : ''}`,
  ];
}

/** An angle wrapped to [0, 360) after rounding, so 359.9996° prints as 0.000°. */
function degText(deg: number, digits: number): string {
  const r = Number(wrapDeg(deg).toFixed(digits));
  return (r >= 360 ? 0 : r).toFixed(digits);
}

function signed(v: number, digits: number): string {
  return `${v >= 0 ? '+' : ''}${v.toFixed(digits)}`;
}

function fmtFactor(f: number): string {
  return Math.abs(f) >= 1 ? f.toPrecision(3).replace(/\.?0+$/, '') : `1/${(1 / f).toPrecision(3).replace(/\.?0+$/, '')}`;
}

function formatRate(hz: number): string {
  if (hz >= 1e6) return `${(hz / 1e6).toPrecision(6)} MS/s`;
  if (hz >= 1e3) return `${(hz / 1e3).toPrecision(6)} kS/s`;
  return `${hz.toPrecision(6)} S/s`;
}

function formatSeconds(s: number): string {
  return s >= 1 ? `${s.toFixed(3)} s` : `${(s * 1000).toFixed(3)} ms`;
}
