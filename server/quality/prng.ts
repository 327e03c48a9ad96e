/**
 * Reproducible random sampling for re-abstraction. mulberry32 is a small 32-bit PRNG
 * (Tommy Ettinger's public-domain generator, widely copied); the same seed and the same pool
 * (ordered by registry number) always give the same sample. Selection is a partial
 * Fisher–Yates shuffle (Durstenfeld R, Commun ACM 1964;7:420), so every subset of the asked size
 * is equally likely.
 */

import { mulberry32 } from '../../analysis/random/mulberry32.js';

export { mulberry32 };

/** `k` items drawn without replacement, in draw order (a copy; the input is not changed). */
export function sampleWithoutReplacement<T>(items: readonly T[], k: number, seed: number): T[] {
  const a = items.slice();
  const n = Math.min(k, a.length);
  const rand = mulberry32(seed);
  for (let i = 0; i < n; i++) {
    const j = i + Math.floor(rand() * (a.length - i));
    [a[i], a[j]] = [a[j], a[i]];
  }
  return a.slice(0, n);
}
