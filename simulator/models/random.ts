// Deterministic, stateless randomness: every draw is a hash of (seed, channel, index), so a value
// at a given time is the same whichever range of history is generated and in whatever order.

/** FNV-1a 32-bit hash of a string. */
export function hashString(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i += 1) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** MurmurHash3 finaliser: a good 32-bit avalanche mix. */
function fmix32(input: number): number {
  let h = input >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** Combines a seed with more parts (strings or numbers) into a new 32-bit seed. */
export function deriveSeed(seed: number | string, ...parts: ReadonlyArray<number | string>): number {
  let h = typeof seed === 'number' ? fmix32(Math.floor(seed) ^ 0x9e3779b9) : hashString(seed);
  for (const part of parts) {
    const p = typeof part === 'number' ? hashIndex(part) : hashString(part);
    h = fmix32(Math.imul(h ^ p, 0x27d4eb2d) + 0x165667b1);
  }
  return h;
}

/** Hash of an integer index that may exceed 32 bits (e.g. seconds since the epoch). */
function hashIndex(index: number): number {
  const i = Math.floor(index);
  const lo = i % 0x100000000;
  const hi = Math.floor(i / 0x100000000);
  return fmix32(fmix32(lo >>> 0) ^ Math.imul(hi | 0, 0x9e3779b1));
}

/** Uniform in [0, 1) for (seed, index). */
export function unitHash(seed: number, index: number): number {
  return fmix32(seed ^ hashIndex(index)) / 0x100000000;
}

/** Uniform in [-1, 1) for (seed, index). */
export function signedHash(seed: number, index: number): number {
  return unitHash(seed, index) * 2 - 1;
}

/**
 * Smooth value noise in [-1, 1]: random knots every `periodHours`, joined with a smoothstep so the
 * curve and its slope are continuous. `tHours` is hours since the epoch.
 */
export function smoothNoise(seed: number, tHours: number, periodHours: number): number {
  const x = tHours / periodHours;
  const i = Math.floor(x);
  const f = x - i;
  const s = f * f * (3 - 2 * f);
  const a = signedHash(seed, i);
  const b = signedHash(seed, i + 1);
  return a + (b - a) * s;
}
