import { accessSync, closeSync, constants, mkdirSync, openSync, statSync, unlinkSync } from 'node:fs';
import { dirname, resolve, sep } from 'node:path';

/**
 * Kernel pseudo file systems: SQLite on them blocks or fails in ways that never reach a message
 * (a file under /proc hung the server silently), so they are refused by name before anything opens them.
 */
const PSEUDO_ROOTS = ['/proc', '/sys', '/dev'];

/**
 * Checks, synchronously and within milliseconds, that the database file can be created and written:
 * the folder exists or can be made, a probe file can be written in it, and an existing database file is
 * a writable regular file.
 * @returns null when usable, otherwise a sentence naming the path and the reason
 */
export function databasePathProblem(dbPath: string): string | null {
  if (dbPath === ':memory:') return null;
  if (!dbPath.trim()) return 'is empty; give a file path such as ./data/railwright.sqlite';
  const file = resolve(dbPath);
  const root = PSEUDO_ROOTS.find((r) => file === r || file.startsWith(r + sep));
  if (root) return `"${file}" is under ${root}, a kernel pseudo file system that cannot hold a database`;
  const dir = dirname(file);
  try {
    mkdirSync(dir, { recursive: true });
  } catch (err) {
    return `the folder "${dir}" cannot be created (${reason(err)})`;
  }
  const probe = resolve(dir, `.railwright-write-probe-${process.pid}`);
  try {
    closeSync(openSync(probe, 'w'));
    unlinkSync(probe);
  } catch (err) {
    return `the folder "${dir}" is not writable (${reason(err)})`;
  }
  try {
    const st = statSync(file);
    if (!st.isFile()) return `"${file}" exists but is not a regular file`;
    accessSync(file, constants.R_OK | constants.W_OK);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') return `"${file}" cannot be read and written (${reason(err)})`;
  }
  return null;
}

function reason(err: unknown): string {
  const e = err as NodeJS.ErrnoException;
  return e.code ? `${e.code}: ${e.message.replace(/^[A-Z]+: /, '')}` : String(e?.message ?? err);
}
