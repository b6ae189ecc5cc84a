import { describe, expect, it } from 'vitest';
import { RandomStream, hashString, mulberry32 } from './prng';

describe('hashString (FNV-1a, 32 bit)', () => {
  it('matches the published FNV-1a 32-bit test vectors', () => {
    // FNV reference test vectors (FNV-1a 32: "" → 811c9dc5, "a" → e40c292c, "foobar" → bf9cf968),
    // as pinned in many public test suites
    expect(hashString('')).toBe(0x811c9dc5);
    expect(hashString('a')).toBe(0xe40c292c);
    expect(hashString('foobar')).toBe(0xbf9cf968);
  });
});

describe('mulberry32', () => {
  // the widely circulated public-domain one-liner, transcribed independently as the oracle
  function reference(a: number) {
    return function () {
      a |= 0;
      a = (a + 0x6d2b79f5) | 0;
      let t = Math.imul(a ^ (a >>> 15), 1 | a);
      t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
      return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
    };
  }

  it('produces the same sequence as the reference form for several seeds', () => {
    for (const seed of [0, 1, 42, 0xdeadbeef, hashString('K5A-2648-00001')]) {
      const ours = mulberry32(seed);
      const theirs = reference(seed);
      for (let i = 0; i < 100; i++) expect(ours()).toBe(theirs());
    }
  });

  it('stays in [0, 1) and is deterministic per seed', () => {
    const a = mulberry32(7);
    const b = mulberry32(7);
    for (let i = 0; i < 1000; i++) {
      const x = a();
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThan(1);
      expect(b()).toBe(x);
    }
  });
});

describe('RandomStream.normal', () => {
  it('has the standard normal mean, spread and central mass', () => {
    const rng = new RandomStream('normal-check');
    const n = 40_000;
    let sum = 0;
    let sumSq = 0;
    let within1 = 0;
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      sum += z;
      sumSq += z * z;
      if (Math.abs(z) <= 1) within1++;
    }
    const mean = sum / n;
    const sd = Math.sqrt(sumSq / n - mean * mean);
    // standard error of the mean is 1/√n = 0.005; allow 4 standard errors
    expect(Math.abs(mean)).toBeLessThan(0.02);
    expect(Math.abs(sd - 1)).toBeLessThan(0.02);
    // P(|Z| ≤ 1) = 2Φ(1) − 1 = 0.682 689; SE ≈ 0.0023 (Φ(1) = 0.841 344 746 068 543 from
    // @stdlib/stats-base-dists-normal-cdf and jStat.normal.cdf as references)
    expect(within1 / n).toBeCloseTo(0.682689, 2);
  });

  it('never goes past the ±4σ clip', () => {
    const rng = new RandomStream(3);
    for (let i = 0; i < 10_000; i++) expect(Math.abs(rng.normal())).toBeLessThanOrEqual(4);
  });
});
