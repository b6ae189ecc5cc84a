import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { databasePathProblem } from './database-path';

describe('databasePathProblem', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-dbpath-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('accepts a new file in a folder it can create', () => {
    expect(databasePathProblem(join(dir, 'a', 'b', 'db.sqlite'))).toBeNull();
    expect(databasePathProblem(':memory:')).toBeNull();
  });

  it('names the path and the reason when the folder cannot be made or the path is a pseudo file system', () => {
    writeFileSync(join(dir, 'file'), 'x');
    expect(databasePathProblem(join(dir, 'file', 'db.sqlite'))).toMatch(/the folder ".*file" cannot be created \((ENOTDIR|EEXIST)/);
    expect(databasePathProblem('/proc/self/db.sqlite')).toMatch(/is under \/proc/);
    expect(databasePathProblem(dir)).toMatch(/exists but is not a regular file/);
  });
});
