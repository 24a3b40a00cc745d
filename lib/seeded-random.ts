/**
 * Deterministic pseudo-random numbers in [0, 1) (mulberry32, a public-domain algorithm by Tommy Ettinger), for the demo data, the
 * benchmarks and seeded tests: the same seed gives the same numbers on every machine.
 *
 * @example const next = seededRandom(1000); next(); // 0.…, the same every run
 */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
