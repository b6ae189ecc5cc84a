import { Controller, Get } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Public } from '../src/common/decorators/public.decorator';
import { createTestApp, login, TEST_JWT_SECRET, TestApp } from './create-test-app';

/** Mounted only in this test: proves the guards fail closed on a route that forgot @Roles(). */
@Controller('probe')
class GuardProbeController {
  @Get('no-roles')
  noRoles() {
    return { reached: true };
  }

  @Get('public')
  @Public()
  open() {
    return { reached: true };
  }
}

const BCRYPT_HASH = /\$2[aby]\$\d\d\$/;

describe('sign-in and route protection', () => {
  let t: TestApp;
  let http: () => ReturnType<typeof request>;
  let adminToken: string;

  beforeAll(async () => {
    t = await createTestApp({}, { controllers: [GuardProbeController] });
    http = () => request(t.app.getHttpServer());
    adminToken = await login(t.app, 'admin');
  });
  afterAll(async () => t?.close());

  async function auditFor(action: string): Promise<Record<string, unknown>[]> {
    const res = await http().get('/api/audit').query({ action, limit: 50 }).set('Authorization', `Bearer ${adminToken}`).expect(200);
    return res.body.items;
  }

  it('signs in a demo user and returns token, lifetime and user, never the hash', async () => {
    const res = await http().post('/api/auth/login').send({ username: 'operator', password: 'operator-demo' }).expect(200);
    expect(res.body.accessToken).toMatch(/^[\w-]+\.[\w-]+\.[\w-]+$/);
    expect(res.body.expiresIn).toBe(12 * 3600); // default JWT_EXPIRES_IN = 12h
    expect(res.body.user).toEqual({ id: expect.any(Number), username: 'operator', displayName: expect.any(String), roles: ['operator'], active: true });
    expect(JSON.stringify(res.body)).not.toMatch(/passwordHash|password/);
    expect(JSON.stringify(res.body)).not.toMatch(BCRYPT_HASH);

    const me = await http().get('/api/auth/me').set('Authorization', `Bearer ${res.body.accessToken}`).expect(200);
    expect(me.body).toEqual(res.body.user);
    expect((await auditFor('auth.login')).some((e) => e.actorName === 'operator')).toBe(true);
  });

  it('puts sub, username and roles in the token', async () => {
    const token = await login(t.app, 'engineer');
    const payload = new JwtService({}).decode(token) as Record<string, unknown>;
    expect(payload).toMatchObject({ sub: expect.any(Number), username: 'engineer', roles: ['engineer'] });
    expect((payload.exp as number) - (payload.iat as number)).toBe(43_200);
  });

  it('refuses a wrong password with 401 and audits it', async () => {
    const res = await http().post('/api/auth/login').send({ username: 'quality', password: 'not-the-password' }).expect(401);
    expect(res.body).toMatchObject({ statusCode: 401, error: 'Unauthorized', message: 'Wrong username or password.' });
    const failed = await auditFor('auth.login_failed');
    expect(failed).toContainEqual(expect.objectContaining({ actorName: 'quality', reason: 'wrong password', entityType: 'user' }));
  });

  it('refuses an unknown user with the same 401 message as a wrong password, and audits the name tried', async () => {
    const wrong = await http().post('/api/auth/login').send({ username: 'admin', password: 'nope-nope' }).expect(401);
    const unknown = await http().post('/api/auth/login').send({ username: 'nobody-here', password: 'nope-nope' }).expect(401);
    expect(unknown.body.message).toBe(wrong.body.message);
    expect(unknown.body.details).toEqual(wrong.body.details);
    const failed = await auditFor('auth.login_failed');
    expect(failed).toContainEqual(expect.objectContaining({ actorName: 'nobody-here', reason: 'unknown user', entityId: null }));
  });

  it('refuses a deactivated user with 401, and stops the tokens it already holds', async () => {
    const created = await http()
      .post('/api/users')
      .set('Authorization', `Bearer ${adminToken}`)
      .send({ username: 'leaver', displayName: 'Leaving operator', password: 'leaver-pass-1', roles: ['operator'] })
      .expect(201);
    const earlierToken = await login(t.app, 'leaver', 'leaver-pass-1');
    await http().patch(`/api/users/${created.body.id}`).set('Authorization', `Bearer ${adminToken}`).send({ active: false }).expect(200);

    const res = await http().post('/api/auth/login').send({ username: 'leaver', password: 'leaver-pass-1' }).expect(401);
    expect(res.body.message).toMatch(/deactivated/);
    const me = await http().get('/api/auth/me').set('Authorization', `Bearer ${earlierToken}`).expect(401);
    expect(me.body.message).toMatch(/deactivated/);
    expect(await auditFor('auth.login_failed')).toContainEqual(expect.objectContaining({ actorName: 'leaver', reason: 'deactivated' }));
  });

  it('answers 401 without a token, with a forged token and with an expired token', async () => {
    const none = await http().get('/api/auth/me').expect(401);
    expect(none.body).toMatchObject({ statusCode: 401, error: 'Unauthorized', message: expect.stringMatching(/no access token/) });

    const forged = new JwtService({ secret: 'some-other-secret-of-16+chars' }).sign({ sub: 1, username: 'admin', roles: ['admin'] });
    const bad = await http().get('/api/users').set('Authorization', `Bearer ${forged}`).expect(401);
    expect(bad.body.message).toMatch(/not valid/);

    const expired = new JwtService({ secret: TEST_JWT_SECRET }).sign(
      { sub: 1, username: 'admin', roles: ['admin'], iat: Math.floor(Date.now() / 1000) - 7200 },
      { expiresIn: 3600 },
    );
    const old = await http().get('/api/users').set('Authorization', `Bearer ${expired}`).expect(401);
    expect(old.body.message).toMatch(/expired/);

    await http().get('/api/users').set('Authorization', 'Bearer not.a.jwt').expect(401);
    await http().get('/api/users').set('Authorization', adminToken).expect(401); // no "Bearer " scheme
  });

  it('answers 403 when the role is missing', async () => {
    const operator = await login(t.app, 'operator');
    const res = await http().get('/api/users').set('Authorization', `Bearer ${operator}`).expect(403);
    expect(res.body).toMatchObject({ statusCode: 403, error: 'Forbidden', details: { code: 'missing_role', required: ['admin'] } });
    await http().get('/api/audit').set('Authorization', `Bearer ${operator}`).expect(403);
    await http().get('/api/audit').set('Authorization', `Bearer ${await login(t.app, 'quality')}`).expect(200);
  });

  it('refuses a route that declares no role, even to an admin (fail closed)', async () => {
    const res = await http().get('/api/probe/no-roles').set('Authorization', `Bearer ${adminToken}`).expect(403);
    expect(res.body.message).toMatch(/route declares no role/);
    await http().get('/api/probe/no-roles').expect(401);
    await http().get('/api/probe/public').expect(200);
  });

  it('refuses an unknown body field with 400 naming the field', async () => {
    const res = await http().post('/api/auth/login').send({ username: 'admin', password: 'admin-demo', rememberMe: true }).expect(400);
    expect(res.body.message).toMatch(/rememberMe/);
    expect(res.body.details).toContainEqual(expect.objectContaining({ field: 'rememberMe' }));
  });

  it('refuses a missing field with 400 naming it', async () => {
    const res = await http().post('/api/auth/login').send({ username: 'admin' }).expect(400);
    expect(res.body.details).toContainEqual(expect.objectContaining({ field: 'password' }));
  });

  it('answers malformed JSON with 400, not 500', async () => {
    const res = await http().post('/api/auth/login').set('Content-Type', 'application/json').send('{"username": "admin", ').expect(400);
    expect(res.body).toMatchObject({ statusCode: 400, error: 'Bad Request', message: expect.stringMatching(/not valid JSON/) });
  });

  it('lets admin and quality read the audit trail, filtered and paged', async () => {
    const res = await http().get('/api/audit').query({ entityType: 'user', limit: 2, offset: 0 }).set('Authorization', `Bearer ${adminToken}`).expect(200);
    expect(res.body.items).toHaveLength(2);
    expect(res.body.total).toBeGreaterThan(2);
    for (const e of res.body.items) expect(e.entityType).toBe('user');
    await http().get('/api/audit').query({ limit: 0 }).set('Authorization', `Bearer ${adminToken}`).expect(400);
    await http().get('/api/audit').query({ color: 'red' }).set('Authorization', `Bearer ${adminToken}`).expect(400);
  });
});
