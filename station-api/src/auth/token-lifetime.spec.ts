import { describe, expect, it } from 'vitest';
import { tokenLifetimeS } from './token-lifetime';

describe('tokenLifetimeS', () => {
  it('reads units as seconds, minutes, hours and days', () => {
    // SI / ISO 80000-3: 1 min = 60 s, 1 h = 3600 s, 1 d = 86 400 s
    expect(tokenLifetimeS('12h')).toBe(43_200);
    expect(tokenLifetimeS('30m')).toBe(1_800);
    expect(tokenLifetimeS('1d')).toBe(86_400);
    expect(tokenLifetimeS('45s')).toBe(45);
  });

  it('reads a bare number as seconds (jsonwebtoken would read the string "3600" as milliseconds)', () => {
    // jsonwebtoken README, option expiresIn: a string without unit is taken as milliseconds
    expect(tokenLifetimeS('3600')).toBe(3600);
  });

  it('refuses anything else with a message naming the setting', () => {
    expect(() => tokenLifetimeS('12 hours')).toThrow(/JWT_EXPIRES_IN/);
    expect(() => tokenLifetimeS('0')).toThrow(/longer than zero/);
  });
});

describe('tokenLifetimeS bound', () => {
  it('refuses lifetimes over 7 days and absurd numbers that would never expire', () => {
    // 7 d = 604 800 s (SI / ISO 80000-3 day of 86 400 s)
    expect(tokenLifetimeS('7d')).toBe(604_800);
    expect(() => tokenLifetimeS('8d')).toThrow(/7 days/);
    expect(() => tokenLifetimeS('99999999999999999999d')).toThrow(/JWT_EXPIRES_IN/);
  });
});
