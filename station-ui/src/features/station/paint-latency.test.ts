import { quantile as d3Quantile } from 'd3-array';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { quantileR7, recordPaintLatency, summariseLatencies } from './paint-latency';

describe('paint latency', () => {
  afterEach(() => {
    delete window.__railwrightPaintLatencyMs;
  });

  it('quantile follows Hyndman & Fan definition 7', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    // by hand from definition 7: h = (n − 1)·p = 8.55 → x[8] + 0.55·(x[9] − x[8]) = 9.55 (1-based x9, x10)
    expect(quantileR7(x, 0.95)).toBeCloseTo(9.55, 12);
    expect(quantileR7(x, 0.5)).toBeCloseTo(5.5, 12);
    expect(quantileR7([42], 0.95)).toBe(42);
    expect(quantileR7([], 0.5)).toBeNaN();
  });

  it('agrees with d3-array, the npm reference implementation', () => {
    // d3-array 3.2 (a dependency of the charts, not of this package directly): its quantile() interpolates
    // at (n − 1)·p between neighbouring order statistics (read in its source), i.e. definition 7
    const samples = [12.4, 3.1, 8.8, 15.0, 4.2, 9.9, 30.5, 7.7, 6.1, 11.3, 5.5, 21.0, 2.2];
    const sorted = [...samples].sort((a, b) => a - b);
    for (const p of [0, 0.25, 0.5, 0.9, 0.95, 0.99, 1]) {
      expect(quantileR7(sorted, p)).toBeCloseTo(d3Quantile(samples, p)!, 12);
    }
    const s = summariseLatencies(samples);
    expect(s).toMatchObject({ count: 13, minMs: 2.2, maxMs: 30.5 });
    expect(s.medianMs).toBeCloseTo(d3Quantile(samples, 0.5)!, 12);
    expect(s.p95Ms).toBeCloseTo(d3Quantile(samples, 0.95)!, 12);
  });

  it('records emit → frame time on the epoch clock', () => {
    const frames: FrameRequestCallback[] = [];
    vi.spyOn(window, 'requestAnimationFrame').mockImplementation((cb) => {
      frames.push(cb);
      return frames.length;
    });
    vi.spyOn(performance, 'now').mockReturnValue(500);
    const paintedAt = performance.timeOrigin + 500;
    recordPaintLatency(paintedAt - 17);
    expect(window.__railwrightPaintLatencyMs).toBeUndefined();
    frames[0]!(0);
    expect(window.__railwrightPaintLatencyMs).toHaveLength(1);
    expect(window.__railwrightPaintLatencyMs![0]).toBeCloseTo(17, 6);
  });
});
