/**
 * Seeded pseudo-random numbers for synthetic captures and tests.
 *
 * Uniforms come from SplitMix32-seeded xoshiro128** (Blackman & Vigna, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 2021); normals from the Box–Muller transform
 * (Box & Muller, Ann. Math. Statist. 29, 1958). Not cryptographic; reproducible across runs.
 */
export interface Random {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal (mean 0, variance 1). */
  normal(): number;
}

export function createRandom(seed: number): Random {
  // SplitMix32 expands the seed into four nonzero state words.
  let s = seed >>> 0;
  const split = (): number => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  let a = split();
  let b = split();
  let c = split();
  let d = split();
  if ((a | b | c | d) === 0) a = 1;

  const next = (): number => {
    const result = Math.imul(rotl(Math.imul(b, 5) >>> 0, 7), 9) >>> 0;
    const t = (b << 9) >>> 0;
    c ^= a;
    d ^= b;
    b ^= c;
    a ^= d;
    c ^= t;
    d = rotl(d, 11);
    return result;
  };

  let spare: number | undefined;
  const uniform = (): number => {
    // 53 bits from two draws.
    const hi = next() >>> 5;
    const lo = next() >>> 6;
    return (hi * 67108864 + lo) / 9007199254740992;
  };
  return {
    uniform,
    normal(): number {
      if (spare !== undefined) {
        const v = spare;
        spare = undefined;
        return v;
      }
      let u = 0;
      while (u === 0) u = uniform();
      const v = uniform();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
  };
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
