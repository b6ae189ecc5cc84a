import { describe, expect, it } from 'vitest';
import { formatClock, formatDuration } from './format';

describe('station formatting', () => {
  it('formats times', () => {
    expect(formatDuration(8_440)).toBe('8.4 s');
    expect(formatDuration(65_000)).toBe('1:05');
    expect(formatClock(5_999)).toBe('0:05');
    expect(formatClock(125_000)).toBe('2:05');
  });
});
