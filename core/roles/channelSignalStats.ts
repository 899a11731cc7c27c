/**
 * Quick per-channel figures used to guess roles: AC RMS, and how steady the RMS is from block to
 * block (coefficient of variation over 16 blocks; an excitation is steady, a turning shaft's
 * stator lines are not).
 */
export interface ChannelSignalStats {
  readonly acRms: number;
  readonly steadiness: number;
}

const BLOCKS = 16;

export function channelSignalStats(samples: ArrayLike<number>, sampleCount: number): ChannelSignalStats {
  const blockRms: number[] = [];
  let totalSq = 0;
  let totalMean = 0;
  let total = 0;
  const size = Math.max(1, Math.floor(sampleCount / BLOCKS));
  for (let b = 0; b < BLOCKS && b * size < sampleCount; b++) {
    let mean = 0;
    let sq = 0;
    let count = 0;
    const end = Math.min(sampleCount, (b + 1) * size);
    for (let i = b * size; i < end; i++) {
      const v = samples[i]!;
      if (!Number.isFinite(v)) continue;
      mean += v;
      sq += v * v;
      count++;
    }
    if (count === 0) continue;
    totalSq += sq;
    totalMean += mean;
    total += count;
    blockRms.push(Math.sqrt(Math.max(0, sq / count - (mean / count) ** 2)));
  }
  const acRms = total ? Math.sqrt(Math.max(0, totalSq / total - (totalMean / total) ** 2)) : 0;
  const avg = blockRms.reduce((a, b) => a + b, 0) / Math.max(1, blockRms.length);
  const sd = Math.sqrt(blockRms.reduce((a, b) => a + (b - avg) ** 2, 0) / Math.max(1, blockRms.length));
  return { acRms, steadiness: avg > 0 ? sd / avg : Infinity };
}
