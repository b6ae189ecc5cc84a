import { describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { describeAdminError } from './admin-error';
import { describeChange, formatStamp } from './audit-screen';
import { checkPassword, checkRoles, checkUsername } from './user-rules';

describe('user rules (mirroring station-api/src/users/dto/user.dto.ts)', () => {
  it('accepts the server pattern for user names and explains refusals', () => {
    for (const ok of ['operator', 'j.okafor', 'a_b-c', '007', 'abc']) expect(checkUsername(ok)).toBeNull();
    expect(checkUsername('')).toBe('Enter a user name.');
    expect(checkUsername('ab')).toMatch(/at least 3/);
    expect(checkUsername('x'.repeat(33))).toMatch(/at most 32/);
    expect(checkUsername('J.Okafor')).toMatch(/lowercase/);
    expect(checkUsername('.hidden')).toMatch(/starting with a letter or digit/);
    expect(checkUsername('j okafor')).toMatch(/lowercase letters, digits/);
  });

  it('asks for 8 to 72 bytes of password (bcrypt reads 72 bytes; NIST SP 800-63B sets 8 as the floor)', () => {
    expect(checkPassword('1234567')).toMatch(/at least 8/);
    expect(checkPassword('12345678')).toBeNull();
    expect(checkPassword('x'.repeat(72))).toBeNull();
    expect(checkPassword('x'.repeat(73))).toMatch(/at most 72/);
    // multi-byte characters count by their UTF-8 bytes, as bcrypt sees them
    expect(checkPassword('ü'.repeat(37))).toMatch(/at most 72/);
  });

  it('needs at least one role', () => {
    expect(checkRoles([])).toBe('Pick at least one role.');
    expect(checkRoles(['quality'])).toBeNull();
  });
});

describe('describeAdminError', () => {
  it('puts field problems beside their fields', () => {
    const errors: Record<string, string> = {};
    const err = new ApiError(400, 'Bad Request', 'x', [{ field: 'password', problems: ['password must be at least 8 characters'] }]);
    const notice = describeAdminError(err, { knownFields: ['password'], setFieldError: (f, m) => (errors[f] = m) });
    expect(notice).toBeNull();
    expect(errors).toEqual({ password: 'Password must be at least 8 characters.' });
  });

  it('says a taken user name in our words, beside the field', () => {
    const errors: Record<string, string> = {};
    const err = new ApiError(409, 'Conflict', 'The username "x" is already taken.', { code: 'username_taken' });
    expect(describeAdminError(err, { username: 'j.okafor', setFieldError: (f, m) => (errors[f] = m) })).toBeNull();
    expect(errors.username).toBe('“j.okafor” is already taken. Choose another user name.');
  });

  it('passes on the server explanation of other refusals (last admin)', () => {
    const message = '"admin" is the last active administrator. Give another active user the admin role first.';
    const err = new ApiError(409, 'Conflict', message, { code: 'last_admin' });
    expect(describeAdminError(err, {})).toBe(message);
  });
});

describe('audit helpers', () => {
  it('lists only the fields that changed', () => {
    expect(describeChange({ roles: ['operator'], displayName: 'A' }, { roles: ['operator', 'quality'], displayName: 'A' })).toEqual([
      'roles: ["operator"] → ["operator","quality"]',
    ]);
    expect(describeChange(null, { active: false })).toEqual(['active: false']);
    expect(describeChange(null, null)).toEqual([]);
  });

  it('writes times as local yyyy-mm-dd hh:mm:ss', () => {
    const iso = new Date(2026, 10, 24, 7, 5, 9).toISOString();
    expect(formatStamp(iso)).toBe('2026-11-24 07:05:09');
    expect(formatStamp('not a time')).toBe('not a time');
  });
});
