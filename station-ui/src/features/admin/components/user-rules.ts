import type { Role } from '@/config/roles';

/*
 * Client-side checks, so most mistakes are caught before sending. They mirror the server's rules in
 * station-api/src/users/dto/user.dto.ts (which validates again, and whose word wins).
 */
export const PASSWORD_MIN_LENGTH = 8;
/** bcrypt reads only the first 72 bytes; the server refuses longer passwords. */
export const PASSWORD_MAX_LENGTH = 72;

export function checkUsername(v: string): string | null {
  const t = v.trim();
  if (!t) return 'Enter a user name.';
  if (t.length < 3) return 'A user name needs at least 3 characters.';
  if (t.length > 32) return 'A user name can have at most 32 characters.';
  if (/[A-Z]/.test(t)) return 'Use lowercase letters only, e.g. “j.okafor”.';
  if (!/^[a-z0-9][a-z0-9._-]*$/.test(t)) {
    return 'Use lowercase letters, digits, dots, dashes or underscores, starting with a letter or digit.';
  }
  return null;
}

export function checkDisplayName(v: string): string | null {
  const t = v.trim();
  if (!t) return 'Enter the name people know this person by.';
  if (t.length > 80) return 'A name can have at most 80 characters.';
  return null;
}

export function checkPassword(v: string): string | null {
  if (!v) return 'Enter a password.';
  if (v.length < PASSWORD_MIN_LENGTH) return `A password needs at least ${PASSWORD_MIN_LENGTH} characters.`;
  if (new TextEncoder().encode(v).length > PASSWORD_MAX_LENGTH) {
    return `A password can have at most ${PASSWORD_MAX_LENGTH} characters.`;
  }
  return null;
}

export function checkRoles(v: Role[]): string | null {
  return v.length > 0 ? null : 'Pick at least one role.';
}
