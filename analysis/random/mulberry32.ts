/**
 * mulberry32: a small 32-bit pseudo-random generator (Tommy Ettinger's public-domain generator,
 * widely copied). The one seeded source of randomness for the demo generator, the benchmark
 * loader, reproducible re-abstraction samples and test factories: the same seed always gives
 * the same stream.
 *
 * @param seed a 32-bit unsigned integer (other numbers are reduced with `>>> 0`)
 * @returns a function giving uniform numbers in [0, 1)
 * @example mulberry32(1)() // 0.6270739405881613
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
