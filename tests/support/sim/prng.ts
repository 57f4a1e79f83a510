/**
 * Seeded pseudo-random numbers so noisy test logs are reproducible.
 * mulberry32 is a public-domain 32-bit generator by Tommy Ettinger (from memory);
 * normal deviates by the Box–Muller transform (Box & Muller, Ann. Math. Statist. 29 (1958) 610).
 */
export interface Prng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Standard normal deviate. */
  normal(): number;
}

export function createPrng(seed: number): Prng {
  let state = seed >>> 0;
  let spare: number | null = null;
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let x = state;
    x = Math.imul(x ^ (x >>> 15), x | 1);
    x ^= x + Math.imul(x ^ (x >>> 7), x | 61);
    return ((x ^ (x >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = next();
    while (u <= Number.MIN_VALUE) u = next();
    const v = next();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { next, normal };
}
