import { describe, expect, it } from 'vitest';
import { describeStorageSize, storageFigures } from './measurement-storage-size';

describe('measurement storage figures', () => {
  it('leaves out free pages and the capture pages, and divides by the measurements', () => {
    // self-constructed example: 122,348 pages of 4,096 B = 501,137,408 B; 10 free pages = 40,960 B;
    // captures 275,595,264 B; (501,137,408 - 40,960 - 275,595,264) / 1,395,576 = 225,501,184 / 1,395,576 = 161.58…
    const s = storageFigures(1_395_576, 122_348, 4096, 10, 275_595_264);
    expect(s.fileBytes).toBe(501_137_408);
    expect(s.freeBytes).toBe(40_960);
    expect(s.capturesExcludedPerMeasurement).toBeCloseTo(225_501_184 / 1_395_576, 9);
    expect(s.wholeFilePerMeasurement).toBeCloseTo(359.09, 2);
    expect(describeStorageSize(s)).toContain('162 bytes per measurement captures excluded');
  });

  it('gives 0 per measurement for an empty database rather than dividing by zero', () => {
    expect(storageFigures(0, 10, 4096, 0, 0).capturesExcludedPerMeasurement).toBe(0);
  });
});
