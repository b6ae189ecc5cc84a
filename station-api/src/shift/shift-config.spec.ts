import 'reflect-metadata';
import { describe, expect, it } from 'vitest';
import { validateEnv } from '../config/env.validation';
import { DEFAULT_SHIFT_STARTS, parseShiftStarts } from './shift';

/** SHIFT_STARTS is checked once at start-up (env.validation.ts); whatever passes must also parse here. */
describe('SHIFT_STARTS configuration', () => {
  it('defaults to three shifts from 06:00', () => {
    expect(validateEnv({}).SHIFT_STARTS).toBe(DEFAULT_SHIFT_STARTS);
    expect(parseShiftStarts(DEFAULT_SHIFT_STARTS).map((s) => s.label)).toEqual(['06:00', '14:00', '22:00']);
  });

  it.each(['07:00,19:00', '22:00, 06:00 ,14:00', '00:00', '05:45,13:45,21:45'])('accepts %j, and the parser agrees', (value) => {
    expect(validateEnv({ SHIFT_STARTS: value }).SHIFT_STARTS).toBe(value);
    expect(() => parseShiftStarts(value)).not.toThrow();
  });

  it.each(['', '6:00', '24:00', '06:00,', '06:00;14:00', '06:00,14:00,06:00', 'morning'])('refuses %j at start-up, naming the variable', (value) => {
    expect(() => validateEnv({ SHIFT_STARTS: value })).toThrow(/SHIFT_STARTS must be times of day written HH:MM/);
    expect(() => parseShiftStarts(value)).toThrow();
  });
});
