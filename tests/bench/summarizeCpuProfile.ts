/**
 * Summarises a V8 .cpuprofile (from `node --cpu-prof`): the functions with the most self time.
 * Usage: tsx tests/bench/summarizeCpuProfile.ts <file.cpuprofile> [top N]
 */
import { readFileSync } from 'node:fs';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount?: number;
}
interface CpuProfile {
  nodes: ProfileNode[];
  startTime: number;
  endTime: number;
  samples: number[];
  timeDeltas: number[];
}

export interface ProfileLine {
  readonly name: string;
  readonly selfMs: number;
  readonly selfPct: number;
}

/** Self time per function name + location, largest first. */
export function summarizeCpuProfile(profile: CpuProfile, top = 15): { totalMs: number; lines: ProfileLine[] } {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const selfUs = new Map<string, number>();
  for (let i = 0; i < profile.samples.length; i++) {
    const node = byId.get(profile.samples[i]!);
    if (!node) continue;
    const f = node.callFrame;
    const file = f.url.split('/').pop() ?? '';
    const key = `${f.functionName || '(anonymous)'} ${file}${file ? `:${f.lineNumber + 1}` : ''}`;
    selfUs.set(key, (selfUs.get(key) ?? 0) + (profile.timeDeltas[i] ?? 0));
  }
  const totalUs = profile.endTime - profile.startTime;
  const lines = [...selfUs.entries()]
    .sort((a, b) => b[1] - a[1])
    .slice(0, top)
    .map(([name, us]) => ({ name, selfMs: us / 1000, selfPct: (100 * us) / totalUs }));
  return { totalMs: totalUs / 1000, lines };
}

if (process.argv[1]?.includes('summarizeCpuProfile')) {
  const file = process.argv[2];
  if (!file) throw new Error('usage: summarizeCpuProfile <file.cpuprofile> [top]');
  const { totalMs, lines } = summarizeCpuProfile(JSON.parse(readFileSync(file, 'utf8')) as CpuProfile, Number(process.argv[3] ?? 15));
  process.stdout.write(`total ${totalMs.toFixed(0)} ms\n`);
  for (const l of lines) process.stdout.write(`${l.selfMs.toFixed(0).padStart(7)} ms ${l.selfPct.toFixed(1).padStart(5)} %  ${l.name}\n`);
}
