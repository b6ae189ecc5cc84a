import { MikroORM } from '@mikro-orm/core';
import { INestApplication, Type } from '@nestjs/common';
import { Test } from '@nestjs/testing';
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import request from 'supertest';
import { inject } from 'vitest';
import { TEMPLATE_DATABASE_KEY, TEMPLATE_SEED_ENV } from './support/template-database';

export interface TestApp {
  app: INestApplication;
  orm: MikroORM;
  dbPath: string;
  close(): Promise<void>;
}

export interface TestAppOptions {
  /** Extra controllers mounted beside the real ones (e.g. to probe the global guards) */
  controllers?: Type<unknown>[];
}

/** The JWT secret the test apps sign with (to forge or pre-date tokens in tests). */
export const TEST_JWT_SECRET = 'test-secret-at-least-32-bytes-long-0123456789';

/**
 * Boots the real Nest application on a fresh temporary SQLite file: migrations applied, demo plant seeded
 * (no run history). Each test file gets its own database: a copy of the template the suite's globalSetup
 * migrated and seeded once (test/support/template-database.ts), or, without a template or when `env`
 * changes what the seeders read, one migrated and seeded here.
 * The sign-in rate limit is raised so that tests logging in often are never throttled; the throttling
 * test passes its own LOGIN_ATTEMPTS_PER_MINUTE.
 */
export async function createTestApp(env: Record<string, string> = {}, options: TestAppOptions = {}): Promise<TestApp> {
  const dir = mkdtempSync(join(tmpdir(), 'railwright-test-'));
  const dbPath = join(dir, 'test.sqlite');
  const template = templateFor(env);
  if (template) copyFileSync(template, dbPath);
  Object.assign(process.env, {
    DATABASE_PATH: dbPath,
    JWT_SECRET: TEST_JWT_SECRET,
    FIXTURE_SIM_TIMING: 'instant',
    SEED_HISTORY: '0',
    LOG_LEVEL: 'error',
    UI_DIST: '',
    LOGIN_ATTEMPTS_PER_MINUTE: '100000',
    ...env,
  });
  // imported after the environment is set: the modules read it when they load
  const { AppModule } = await import('../src/app.module');
  const { configureApp } = await import('../src/app.setup');
  const { DatabaseSeeder } = await import('../src/database/seeders/DatabaseSeeder');
  const moduleRef = await Test.createTestingModule({ imports: [AppModule], controllers: options.controllers ?? [] }).compile();
  const app = moduleRef.createNestApplication({ logger: ['error'] });
  configureApp(app);
  const orm = app.get(MikroORM);
  // The configuration module validates the environment once, when app.module first loads in this process:
  // a second app in the same test file opens the first app's DATABASE_PATH (a fresh file there, since the
  // first app's close() removed it), not this call's copy. So the copy counts only where the app opens it.
  const openedPath = orm.config.get('dbName') ?? dbPath;
  const seeded = template !== undefined && openedPath === dbPath;
  // a no-op on the template's copy; kept so a copy can never run behind the migrations in src/
  await orm.getMigrator().up();
  if (!seeded) await orm.getSeeder().seed(DatabaseSeeder);
  await app.init();
  return {
    app,
    orm,
    dbPath: openedPath,
    async close() {
      await app.close();
      rmSync(dir, { recursive: true, force: true });
      if (openedPath !== dbPath) rmSync(dirname(openedPath), { recursive: true, force: true });
    },
  };
}

/** The template database to copy, or undefined when there is none or `env` changes what the seeders read. */
function templateFor(env: Record<string, string>): string | undefined {
  // outside a Vitest run with the globalSetup (e.g. the crash harness's own config) nothing is provided
  const template = inject(TEMPLATE_DATABASE_KEY) as string | undefined;
  const seedEnv: Record<string, string> = TEMPLATE_SEED_ENV;
  const sameSeed = Object.keys(seedEnv).every((key) => (env[key] ?? seedEnv[key]) === seedEnv[key]);
  return template && sameSeed ? template : undefined;
}

/**
 * Signs in through the real login route and returns the bearer token.
 * The demo users' passwords are `<username>-demo`, the default here.
 */
export async function login(app: INestApplication, username: string, password = `${username}-demo`): Promise<string> {
  const res = await request(app.getHttpServer()).post('/api/auth/login').send({ username, password });
  if (res.status !== 200) throw new Error(`login as ${username} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.accessToken as string;
}
