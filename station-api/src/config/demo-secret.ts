import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { JWT_SECRET_MIN_BYTES } from './env.validation';

/** File in the data folder (next to the database) holding the demo's signing secret. */
export const DEMO_SECRET_FILE = 'jwt-secret';

/**
 * Demo mode only: the signing secret kept beside the database, made from 48 random bytes on first start.
 * It lives in the data folder (git-ignored), never in the repository, so no two demo installs share one
 * and nobody can mint tokens from the source code.
 * @returns the secret and whether it was created now
 */
export function demoSecret(databasePath: string): { secret: string; file: string; created: boolean } {
  const dir = databasePath === ':memory:' ? resolve('data') : dirname(resolve(databasePath));
  const file = join(dir, DEMO_SECRET_FILE);
  if (existsSync(file)) {
    const secret = readFileSync(file, 'utf8').trim();
    if (Buffer.byteLength(secret) >= JWT_SECRET_MIN_BYTES) return { secret, file, created: false };
  }
  mkdirSync(dir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  // owner-only: anyone who can read it can sign in as anybody
  writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  return { secret, file, created: true };
}
