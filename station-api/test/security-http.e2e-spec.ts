import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';

/** One regression test per defect of the security issue that a single request shows. */
describe('HTTP hardening', () => {
  let t: TestApp;
  const tokens: Record<string, string> = {};
  const http = () => request(t.app.getHttpServer());
  const as = (role: string, req: request.Test) => req.set('Authorization', `Bearer ${tokens[role]}`);

  beforeAll(async () => {
    const ui = mkdtempSync(join(tmpdir(), 'railwright-ui-'));
    writeFileSync(join(ui, 'index.html'), '<!doctype html><title>station ui</title>');
    t = await createTestApp({ UI_DIST: ui });
    for (const role of ['operator', 'engineer', 'quality', 'admin']) tokens[role] = await login(t.app, role);
  });
  afterAll(() => t?.close());

  it('sends security headers and no X-Powered-By', async () => {
    const res = await http().get('/api/docs/openapi.json').expect(200);
    expect(res.headers['x-powered-by']).toBeUndefined();
    // helmet 8 defaults (helmet README, "Reference")
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    // plain HTTP on the plant network: nothing may push browsers to an HTTPS port that does not exist
    expect(res.headers['content-security-policy']).not.toContain('upgrade-insecure-requests');
    expect(res.headers['strict-transport-security']).toBeUndefined();
  });

  it('gives no CORS grant to an origin that is not configured', async () => {
    const res = await http().get('/api/auth/me').set('Origin', 'http://evil.example');
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
  });

  it('answers bad bodies with 400/413 in the API shape, and never answers an /api path with the UI', async () => {
    const bad = await http().post('/api/auth/login').set('Content-Type', 'application/json').send('{"username": ').expect(400);
    expect(bad.body).toMatchObject({ statusCode: 400, error: 'Bad Request', message: expect.stringMatching(/not valid JSON/) });
    const big = await http().post('/api/auth/login').set('Content-Type', 'application/json').send(JSON.stringify({ username: 'x'.repeat(200_000) })).expect(413);
    expect(big.body.message).toMatch(/larger than the 100kb/);
    const unknown = await http().get('/api/no-such-thing').expect(404);
    expect(unknown.body).toMatchObject({ statusCode: 404, message: expect.any(String) });
    expect(unknown.text).not.toContain('station ui');
    // (the UI itself is served by the real server process: test/startup.e2e-spec.ts checks the same there)
  });

  it('refuses text/plain, XML and form bodies with 415 instead of answering 200 and changing nothing', async () => {
    const user = (await as('admin', http().get('/api/users'))).body[0];
    for (const [type, body] of [['text/plain', 'displayName=x'], ['application/xml', '<u/>'], ['application/x-www-form-urlencoded', 'displayName=x']]) {
      const res = await as('admin', http().patch(`/api/users/${user.id}`)).set('Content-Type', type).send(body).expect(415);
      expect(res.body.message).toMatch(/only JSON bodies/);
    }
  });

  it('refuses a NUL byte in the sign-in name with 400 naming the field (no token needed, nothing logged raw)', async () => {
    const res = await http().post('/api/auth/login').send({ username: 'admin\u0000', password: 'admin-demo' }).expect(400);
    expect(res.body).toMatchObject({ message: expect.stringMatching(/^username contains a control character \(U\+0000\)/), details: { field: 'username' } });
  });

  it('refuses 5,000 levels of nesting and prototype keys, naming the field', async () => {
    const deep = '{"a":'.repeat(5000) + '1' + '}'.repeat(5000);
    const res = await http().post('/api/auth/login').set('Content-Type', 'application/json').send(deep).expect(400);
    expect(res.body.message).toMatch(/nested more than 32 levels/);
    const proto = await http().post('/api/auth/login').set('Content-Type', 'application/json').send('{"username":"a","password":"b","__proto__":{"x":1}}').expect(400);
    expect(proto.body).toMatchObject({ message: 'Field "__proto__" is not allowed: "__proto__" is a reserved name', details: { field: '__proto__' } });
    const ctor = await as('admin', http().post('/api/users')).send({ constructor: { name: 'x' } }).expect(400);
    expect(ctor.body.details.field).toBe('constructor');
  });

  it('refuses %00 in a serial in the path with 400', async () => {
    const res = await as('admin', http().get('/api/units/OB-BK%00-1')).expect(400);
    expect(res.body.message).toMatch(/control character/);
  });

  it('refuses null in optional fields that cannot be empty, and lets null clear the fields that can', async () => {
    const user = (await as('admin', http().get('/api/users'))).body[0];
    const res = await as('admin', http().patch(`/api/users/${user.id}`)).send({ displayName: null }).expect(400);
    expect(res.body.message).toMatch(/displayName cannot be null/);
    const product = (await as('admin', http().get('/api/products'))).body[0];
    expect((await as('admin', http().patch(`/api/products/${product.id}`)).send({ name: null }).expect(400)).body.message).toMatch(/name cannot be null/);
    const fixture = (await as('admin', http().get('/api/fixtures'))).body[0];
    expect((await as('admin', http().patch(`/api/fixtures/${fixture.id}`)).send({ baudRate: null }).expect(400)).body.message).toMatch(/baudRate cannot be null/);
    const station = (await as('admin', http().get('/api/stations'))).body.find((s: { activeLotId: number | null }) => s.activeLotId !== null);
    const cleared = await as('admin', http().patch(`/api/stations/${station.id}`)).send({ activeLotId: null }).expect(200);
    expect(cleared.body.activeLot).toBeNull();
  });

  it('accepts only /dev/tty*, /dev/pts/<n>, /dev/serial/by-id/*, COMn and mock:<name> as port paths', async () => {
    const fixture = (await as('engineer', http().get('/api/fixtures'))).body[0];
    for (const bad of ['/dev/../etc/passwd', '/dev/tty/../../etc/passwd', '/etc/passwd', '/dev/sda', '/dev/pts/x', '/dev/pts/../tty', 'COM0', 'mock:../x', '/dev/serial/by-id/..']) {
      const res = await as('engineer', http().patch(`/api/fixtures/${fixture.id}`)).send({ portPath: bad }).expect(400);
      expect(res.body.details).toContainEqual(expect.objectContaining({ field: 'portPath' }));
    }
    for (const good of ['/dev/ttyUSB0', '/dev/ttyACM1', '/dev/pts/3', '/dev/serial/by-id/usb-FTDI_FT232R_A1B2C3-if00-port0', 'COM3', fixture.portPath]) {
      await as('engineer', http().patch(`/api/fixtures/${fixture.id}`)).send({ portPath: good }).expect(200);
    }
  });

  it('lets quality set a station lot but not move a fixture; admin may add and release plan versions', async () => {
    const station = (await as('quality', http().get('/api/stations'))).body[0];
    const res = await as('quality', http().patch(`/api/stations/${station.id}`)).send({ fixtureId: null }).expect(403);
    expect(res.body.message).toMatch(/Only engineer or admin may change a station's fixture/);
    await as('engineer', http().patch(`/api/stations/${station.id}`)).send({ fixtureId: station.fixtureId }).expect(200);
    // admin passes the role check on plan versions (the body is then judged like an engineer's)
    const plan = (await as('admin', http().get('/api/plans'))).body[0];
    const draft = await as('admin', http().post(`/api/plans/${plan.id}/versions`)).send({});
    expect(draft.status).toBe(400);
  });

  it('issues board display tokens to admins only; such a token opens the board and nothing else', async () => {
    await as('engineer', http().post('/api/auth/board-token')).send({ label: 'Hall 2 wall' }).expect(403);
    const missing = await as('admin', http().post('/api/auth/board-token')).send({}).expect(400);
    expect(missing.body.details).toContainEqual(expect.objectContaining({ field: 'label' }));
    const res = await as('admin', http().post('/api/auth/board-token')).send({ label: 'Hall 2 wall' }).expect(201);
    const days = (Date.parse(res.body.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(29.9);
    expect(days).toBeLessThanOrEqual(30);
    const board = (path: string) => http().get(path).set('Authorization', `Bearer ${res.body.token}`);
    await board('/api/board').expect(200);
    expect((await board('/api/runs').expect(403)).body.details.code).toBe('board_display_only');
    await board('/api/auth/me').expect(403);
    const audit = await as('admin', http().get('/api/audit')).query({ action: 'auth.board_token_issued' }).expect(200);
    expect(audit.body.items[0]).toMatchObject({ reason: 'Hall 2 wall', actorName: 'admin' });
  });
});
