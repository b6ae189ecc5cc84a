import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { NestFactory } from '@nestjs/core';
import type { INestApplication } from '@nestjs/common';
import { TEST_JWT_SECRET } from './create-test-app';

/**
 * Issue 11: the UI's hashed build files went out with `max-age=0`. The built UI is a self-constructed stand-in
 * (an index.html and a hashed chunk, named the way Vite names them). Cache-Control values per RFC 9111 §5.2.2
 * (max-age, no-cache) and RFC 8246 (immutable).
 */
describe('static UI caching', () => {
  let t: { app: INestApplication };
  let dist: string;
  let dbDir: string;

  beforeAll(async () => {
    dist = mkdtempSync(join(tmpdir(), 'railwright-ui-'));
    mkdirSync(join(dist, 'assets'));
    writeFileSync(join(dist, 'index.html'), '<!doctype html><html><head><script type="module" src="/assets/index-Bx7dQ2aa.js"></script></head><body></body></html>');
    writeFileSync(join(dist, 'assets', 'index-Bx7dQ2aa.js'), `console.log(${JSON.stringify('x'.repeat(4000))});`);
    writeFileSync(join(dist, 'favicon.svg'), '<svg xmlns="http://www.w3.org/2000/svg"/>');
    // built with NestFactory as main.ts does: under Test.createTestingModule the static module's loader is made
    // before the HTTP adapter exists and serves nothing (so createTestApp cannot show static serving)
    dbDir = mkdtempSync(join(tmpdir(), 'railwright-test-'));
    Object.assign(process.env, {
      DATABASE_PATH: join(dbDir, 'test.sqlite'),
      JWT_SECRET: TEST_JWT_SECRET,
      FIXTURE_SIM_TIMING: 'instant',
      SEED_HISTORY: '0',
      LOG_LEVEL: 'error',
      UI_DIST: dist,
    });
    const { AppModule } = await import('../src/app.module');
    const { configureApp } = await import('../src/app.setup');
    const { MikroORM } = await import('@mikro-orm/core');
    const app = await NestFactory.create(AppModule, { logger: ['error'] });
    configureApp(app);
    await app.get(MikroORM).getMigrator().up();
    await app.init();
    t = { app };
  });
  afterAll(async () => {
    await t?.app.close();
    rmSync(dist, { recursive: true, force: true });
    rmSync(dbDir, { recursive: true, force: true });
  });

  it('sends hashed assets as immutable for a year', async () => {
    const res = await request(t.app.getHttpServer()).get('/assets/index-Bx7dQ2aa.js').expect(200);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(res.headers['content-type']).toMatch(/javascript/);
    // helmet still answers for the static files
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });

  it('makes the browser revalidate index.html, at / and at a client-side route, and other unhashed files', async () => {
    for (const path of ['/', '/index.html', '/board', '/runs/42']) {
      const res = await request(t.app.getHttpServer()).get(path).expect(200);
      expect(res.headers['cache-control'], path).toBe('no-cache');
      expect(res.text, path).toContain('index-Bx7dQ2aa.js');
    }
    const icon = await request(t.app.getHttpServer()).get('/favicon.svg').expect(200);
    expect(icon.headers['cache-control']).toBe('no-cache');
  });

  it('never marks a missing asset as immutable', async () => {
    const res = await request(t.app.getHttpServer()).get('/assets/index-Gone0000.js');
    expect(res.headers['cache-control']).not.toMatch(/immutable/);
  });

  it('leaves the API alone: no static caching, errors still in the API shape', async () => {
    const res = await request(t.app.getHttpServer()).get('/api/board').expect(401);
    expect(res.headers['cache-control'] ?? '').not.toMatch(/immutable|max-age=31536000/);
    expect(res.body.message).toEqual(expect.any(String));
    await request(t.app.getHttpServer()).get('/api/no-such-route').expect(404);
  });

  it('keeps the body limit in front of the static UI', async () => {
    const res = await request(t.app.getHttpServer())
      .post('/api/auth/login')
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ username: 'x', password: 'y'.repeat(2_000_000) }));
    expect(res.status).toBe(413);
  });
});
