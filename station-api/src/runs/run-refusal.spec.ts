import { HttpException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { ApiExceptionFilter } from '../common/filters/http-exception.filter';
import { normaliseSerial, RunRefusal } from './run-refusal';

describe('RunRefusal', () => {
  it('is answered by the global error filter with its status and details.code (no per-route mapping)', () => {
    const err = new RunRefusal('wrong_lot', 'K5A-2647-00001 belongs to lot LB-1.', { unitLot: 'LB-1' });
    expect(err).toBeInstanceOf(HttpException);
    expect(new ApiExceptionFilter().toBody(err)).toEqual({
      statusCode: 409,
      error: 'Conflict',
      message: 'K5A-2647-00001 belongs to lot LB-1.',
      details: { code: 'wrong_lot', unitLot: 'LB-1' },
    });
  });
});

describe('normaliseSerial', () => {
  it('trims and upper-cases a serial typed by hand', () => {
    expect(normaliseSerial('  k5a-2647-00001\n')).toBe('K5A-2647-00001');
  });

  it.each(['hello world', '', '   ', 'K5A 2647', 'x'.repeat(65), 'K5A-2647-00001;DROP'])('refuses %j as not a serial', (text) => {
    try {
      normaliseSerial(text);
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(RunRefusal);
      expect((err as RunRefusal).code).toBe('not_a_serial');
      expect((err as RunRefusal).getStatus()).toBe(422);
      expect((err as RunRefusal).message).not.toMatch(/\ba OB-/);
    }
  });
});
