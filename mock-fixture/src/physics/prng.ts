/**
 * Deterministic pseudo-random numbers, so that the same serial always models the same unit and the same
 * command sequence always yields the same readings. Not for cryptography.
 */

/**
 * 32-bit FNV-1a hash of the UTF-8 bytes of a string, used to turn serials, lot codes and fixture ids into
 * PRNG seeds.
 */
export function hashString(text: string): number {
  let hash = 0x811c9dc5;
  for (const byte of Buffer.from(text, 'utf8')) {
    hash ^= byte;
    hash = Math.imul(hash, 0x01000193);
  }
  return hash >>> 0;
}

/** A source of uniform numbers in [0, 1). */
export type UniformSource = () => number;

/** mulberry32: a small 32-bit generator with a full 2^32 period; returns uniform numbers in [0, 1). */
export function mulberry32(seed: number): UniformSource {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A seeded random stream with the draws the simulator needs. */
export class RandomStream {
  private readonly next: UniformSource;
  private spareNormal: number | null = null;

  constructor(seed: number | string) {
    this.next = mulberry32(typeof seed === 'string' ? hashString(seed) : seed);
  }

  /** Uniform in [0, 1). */
  uniform(): number {
    return this.next();
  }

  /** Uniform in [lo, hi). */
  between(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next();
  }

  /**
   * Standard normal draw by the Box–Muller transform (both outputs used). Clipped to ±clip so that a
   * modelled part never takes an absurd value from a far tail.
   */
  normal(clip = 4): number {
    let z: number;
    if (this.spareNormal !== null) {
      z = this.spareNormal;
      this.spareNormal = null;
    } else {
      // 1 − u keeps the logarithm's argument in (0, 1]
      const u1 = 1 - this.next();
      const u2 = this.next();
      const radius = Math.sqrt(-2 * Math.log(u1));
      z = radius * Math.cos(2 * Math.PI * u2);
      this.spareNormal = radius * Math.sin(2 * Math.PI * u2);
    }
    return Math.max(-clip, Math.min(clip, z));
  }

  /** Gaussian with the given mean and standard deviation (clipped at ±4σ). */
  gaussian(mean: number, sd: number): number {
    return mean + sd * this.normal();
  }
}
