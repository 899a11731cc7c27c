/**
 * Regenerates sample-captures/synthetic from fixed seeds: one CSV per demo scenario, its
 * *.expected.json (the truth it was made from), and the folder README. Run: npm run samples.
 */
import { mkdirSync, writeFileSync, openSync, writeSync, closeSync, renameSync } from 'node:fs';
import { join } from 'node:path';
import { formatCaptureCsv, CSV_LAYOUTS, type CsvLayoutSpec } from '../core/synth/formatCaptureCsv.js';
import { synthesizeCapture } from '../core/synth/synthesizeCapture.js';
import { DEMO_SCENARIOS, type DemoScenario } from './demoScenarios.js';

export function layoutOf(scenario: DemoScenario): CsvLayoutSpec {
  const layout = CSV_LAYOUTS[scenario.layout];
  if (!layout) throw new Error(`unknown layout ${scenario.layout}`);
  // Five significant digits: more than a 12-bit scope resolves, and it keeps the files small;
  // time stamps with eight, as scopes print them.
  return { ...layout, valueDigits: 5, timeDigits: 8, ...scenario.layoutChanges };
}

/** The truth a scenario was generated from, as written to *.expected.json. */
export function expectedOf(scenario: DemoScenario): Record<string, unknown> {
  const syn = synthesizeCapture(scenario.spec);
  const unit = scenario.spec.units[0]!;
  const times = Array.from({ length: 21 }, (_, i) => (scenario.spec.durationS * (0.025 + 0.95 * (i / 20))));
  return {
    scenario: scenario.name,
    shows: scenario.shows,
    layout: scenario.layout,
    seed: scenario.spec.seed,
    sampleRateHz: scenario.spec.sampleRateHz,
    samples: syn.capture.sampleCount,
    carrierHz: scenario.spec.carrier.frequencyHz,
    referenceRmsV: scenario.spec.includeReference === false ? null : scenario.spec.carrier.rmsV,
    kind: unit.kind,
    transformationRatio: unit.transformationRatio,
    phaseLeadDeg: unit.phaseLeadDeg,
    roles: syn.roles,
    ambiguous180: scenario.spec.includeReference === false,
    angle: times.map((tS) => ({ tS, deg: ((syn.angleDeg(tS) % 360) + 360) % 360 })),
    expectedFindings: scenario.expectedFindings,
  };
}

function writeAtomic(path: string, write: (fd: number) => void): void {
  const temp = `${path}.tmp`;
  const fd = openSync(temp, 'w');
  try {
    write(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(temp, path);
}

function main(): void {
  const folder = join(__dirname, '..', 'sample-captures', 'synthetic');
  mkdirSync(folder, { recursive: true });
  const readme: string[] = [
    '# Demo captures',
    '',
    'Synthetic captures of our own scenarios, generated from fixed seeds by `npm run samples`',
    '(tools/generateSamples.ts, using the same generator as the tests). Each `*.csv` has a',
    '`*.expected.json` holding the truth it was made from: carrier, transformation ratio, phase',
    'lead and the shaft angle at 21 instants. Licence: same as the project.',
    '',
    '| file | what it shows |',
    '|---|---|',
  ];
  for (const scenario of DEMO_SCENARIOS) {
    const syn = synthesizeCapture(scenario.spec);
    const csvPath = join(folder, `${scenario.name}.csv`);
    const layout = layoutOf(scenario);
    writeAtomic(csvPath, (fd) => {
      const channels = syn.capture.channels.map((c) => ({ label: c.label, samples: c.samples }));
      for (const chunk of formatCaptureCsv({ sampleRateHz: scenario.spec.sampleRateHz, startS: 0, channels }, layout)) {
        writeSync(fd, chunk);
      }
    });
    writeFileSync(join(folder, `${scenario.name}.expected.json`), `${JSON.stringify(expectedOf(scenario), null, 1)}\n`);
    readme.push(`| synthetic/${scenario.name}.csv | ${scenario.shows} |`);
    process.stdout.write(`wrote ${csvPath}\n`);
  }
  writeFileSync(join(folder, '..', 'README.md'), `${readme.join('\n')}\n`);
}

if (require.main === module) main();
