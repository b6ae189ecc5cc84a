import { describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { describeAdminError } from './admin-error';
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
