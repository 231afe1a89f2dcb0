/**
 * The seeded random numbers of the invented data generators and the tests: mulberry32, a small
 * 32-bit PRNG (common practice for reproducible test data; no citable specification).
 * Plain Node ESM, no dependencies.
 */

/** @param {number} seed @returns {() => number} uniform numbers in [0, 1) */
export function mulberry32(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
