const UNIT_S: Record<string, number> = { s: 1, m: 60, h: 3600, d: 86400 };

/**
 * Longest sign-in allowed: 7 days. A token cannot be withdrawn before it expires (only deactivation is
 * re-checked per request), so a bound keeps a leaked token from working for ever. Common practice, no source.
 */
export const MAX_TOKEN_LIFETIME_S = 7 * 86_400;

/**
 * Converts the JWT_EXPIRES_IN setting to seconds: a bare number is seconds, otherwise a number with one
 * of s, m, h, d. Done here rather than handing the string to jsonwebtoken because that library reads a
 * bare numeric *string* as milliseconds ("3600" would be 3.6 s), which is not what the setting means.
 * @returns token lifetime in seconds, at most MAX_TOKEN_LIFETIME_S
 */
export function tokenLifetimeS(setting: string): number {
  const m = /^(\d{1,9})(s|m|h|d)?$/.exec(setting.trim());
  if (!m) throw new Error(`JWT_EXPIRES_IN "${setting}" is not a number of seconds or a number followed by s, m, h or d`);
  const seconds = Number(m[1]) * UNIT_S[m[2] ?? 's'];
  if (seconds <= 0) throw new Error('JWT_EXPIRES_IN must be longer than zero');
  if (seconds > MAX_TOKEN_LIFETIME_S) throw new Error(`JWT_EXPIRES_IN "${setting}" is longer than the 7 days allowed`);
  return seconds;
}
