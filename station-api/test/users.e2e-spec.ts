import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';

const BCRYPT_HASH = /\$2[aby]\$\d\d\$/;

describe('user administration', () => {
  let t: TestApp;
  let admin: string;
  const http = () => request(t.app.getHttpServer());
  const asAdmin = <T extends request.Test>(r: T) => r.set('Authorization', `Bearer ${admin}`);
  /** every body the users API returns is checked for password material */
  const noSecrets = (body: unknown) => {
    const text = JSON.stringify(body);
    expect(text).not.toMatch(/passwordHash|"password"/);
    expect(text).not.toMatch(BCRYPT_HASH);
  };

  beforeAll(async () => {
    t = await createTestApp();
    admin = await login(t.app, 'admin');
  });
  afterAll(async () => t?.close());

  it('lists the demo users without any hash', async () => {
    const res = await asAdmin(http().get('/api/users')).expect(200);
    expect(res.body.map((u: { username: string }) => u.username).sort()).toEqual(['admin', 'engineer', 'engineer2', 'operator', 'quality']);
    noSecrets(res.body);
  });

  it('is for admins only', async () => {
    const engineer = await login(t.app, 'engineer');
    await http().get('/api/users').set('Authorization', `Bearer ${engineer}`).expect(403);
    await http().post('/api/users').set('Authorization', `Bearer ${engineer}`).send({}).expect(403);
  });

  it('creates a user who can then sign in; the change is audited without the hash', async () => {
    const res = await asAdmin(http().post('/api/users'))
      .send({ username: 'r.lindqvist', displayName: 'R. Lindqvist', password: 'first-pass-9', roles: ['operator', 'quality'] })
      .expect(201);
    expect(res.body).toEqual({ id: expect.any(Number), username: 'r.lindqvist', displayName: 'R. Lindqvist', roles: ['operator', 'quality'], active: true });
    noSecrets(res.body);
    await login(t.app, 'r.lindqvist', 'first-pass-9');

    const audit = await asAdmin(http().get('/api/audit')).query({ entityType: 'user', entityId: String(res.body.id), action: 'user.created' }).expect(200);
    expect(audit.body.items).toHaveLength(1);
    expect(audit.body.items[0]).toMatchObject({ actorName: 'admin', after: { username: 'r.lindqvist', roles: ['operator', 'quality'] } });
    noSecrets(audit.body);
  });

  it('refuses a duplicate username with 409', async () => {
    const res = await asAdmin(http().post('/api/users')).send({ username: 'operator', displayName: 'Again', password: 'another-pass', roles: ['operator'] }).expect(409);
    expect(res.body).toMatchObject({ statusCode: 409, error: 'Conflict', details: { code: 'username_taken' } });
    expect(res.body.message).toMatch(/already taken/);
  });

  it('validates roles, password length and unknown fields, naming each field', async () => {
    const bad = await asAdmin(http().post('/api/users')).send({ username: 'x1', displayName: '', password: 'short', roles: ['operator', 'superuser'] }).expect(400);
    const fields = bad.body.details.map((d: { field: string }) => d.field);
    expect(fields).toEqual(expect.arrayContaining(['username', 'displayName', 'password', 'roles']));
    expect(bad.body.message).toMatch(/at least 8 characters/);
    expect(bad.body.message).toMatch(/operator, engineer, quality, admin/);

    const none = await asAdmin(http().post('/api/users')).send({ username: 'no-roles', displayName: 'No roles', password: 'long-enough', roles: [] }).expect(400);
    expect(none.body.details).toContainEqual(expect.objectContaining({ field: 'roles' }));

    const extra = await asAdmin(http().post('/api/users'))
      .send({ username: 'sneaky', displayName: 'S', password: 'long-enough', roles: ['operator'], passwordHash: 'x' })
      .expect(400);
    expect(extra.body.message).toMatch(/passwordHash/);
  });

  it('updates display name and roles, auditing before and after', async () => {
    const [quality] = (await asAdmin(http().get('/api/users'))).body.filter((u: { username: string }) => u.username === 'quality');
    const res = await asAdmin(http().patch(`/api/users/${quality.id}`)).send({ displayName: 'Quality lead', roles: ['quality', 'engineer'] }).expect(200);
    expect(res.body).toMatchObject({ displayName: 'Quality lead', roles: ['quality', 'engineer'], active: true });
    noSecrets(res.body);

    const audit = await asAdmin(http().get('/api/audit')).query({ entityType: 'user', entityId: String(quality.id), action: 'user.updated' }).expect(200);
    expect(audit.body.items[0]).toMatchObject({ before: { roles: ['quality'] }, after: { displayName: 'Quality lead', roles: ['quality', 'engineer'] } });
    noSecrets(audit.body);
  });

  it('answers 404 for an unknown user and 400 for a non-numeric id', async () => {
    await asAdmin(http().patch('/api/users/9999')).send({ displayName: 'Ghost' }).expect(404);
    await asAdmin(http().patch('/api/users/abc')).send({ displayName: 'Ghost' }).expect(400);
  });

  it('resets a password: the new one works, the old one no longer does', async () => {
    const [op] = (await asAdmin(http().get('/api/users'))).body.filter((u: { username: string }) => u.username === 'operator');
    await asAdmin(http().post(`/api/users/${op.id}/password`)).send({ password: 'short' }).expect(400);
    const res = await asAdmin(http().post(`/api/users/${op.id}/password`)).send({ password: 'a-new-operator-pass' }).expect(204);
    expect(res.text).toBe('');
    await http().post('/api/auth/login').send({ username: 'operator', password: 'operator-demo' }).expect(401);
    await login(t.app, 'operator', 'a-new-operator-pass');
    const audit = await asAdmin(http().get('/api/audit')).query({ action: 'user.password_reset', entityId: String(op.id) }).expect(200);
    expect(audit.body.items).toHaveLength(1);
    noSecrets(audit.body);
  });

  it('keeps at least one active admin: refuses to deactivate or demote the last one with 409', async () => {
    const users = (await asAdmin(http().get('/api/users'))).body as { id: number; username: string }[];
    const adminUser = users.find((u) => u.username === 'admin')!;

    const off = await asAdmin(http().patch(`/api/users/${adminUser.id}`)).send({ active: false }).expect(409);
    expect(off.body).toMatchObject({ details: { code: 'last_admin' }, message: expect.stringMatching(/last active administrator/) });
    const demote = await asAdmin(http().patch(`/api/users/${adminUser.id}`)).send({ roles: ['engineer'] }).expect(409);
    expect(demote.body.details.code).toBe('last_admin');

    // a second admin who is deactivated does not count
    const second = await asAdmin(http().post('/api/users')).send({ username: 'admin2', displayName: 'Second admin', password: 'admin2-pass', roles: ['admin'] }).expect(201);
    await asAdmin(http().patch(`/api/users/${second.body.id}`)).send({ active: false }).expect(200);
    await asAdmin(http().patch(`/api/users/${adminUser.id}`)).send({ active: false }).expect(409);

    // once another admin is active, the first may step down
    await asAdmin(http().patch(`/api/users/${second.body.id}`)).send({ active: true }).expect(200);
    const ok = await asAdmin(http().patch(`/api/users/${adminUser.id}`)).send({ roles: ['engineer'] }).expect(200);
    expect(ok.body.roles).toEqual(['engineer']);

    // the old admin's token now carries roles it no longer has: roles are re-read on every request
    await http().get('/api/users').set('Authorization', `Bearer ${admin}`).expect(403);
    admin = await login(t.app, 'admin2', 'admin2-pass');
    const audit = await asAdmin(http().get('/api/audit')).query({ action: 'user.deactivated' }).expect(200);
    expect(audit.body.items.length).toBeGreaterThanOrEqual(1);
  });

  it('reactivates a deactivated user', async () => {
    const created = await asAdmin(http().post('/api/users')).send({ username: 'temp.op', displayName: 'Temp', password: 'temp-pass-1', roles: ['operator'] }).expect(201);
    await asAdmin(http().patch(`/api/users/${created.body.id}`)).send({ active: false }).expect(200);
    await http().post('/api/auth/login').send({ username: 'temp.op', password: 'temp-pass-1' }).expect(401);
    const back = await asAdmin(http().patch(`/api/users/${created.body.id}`)).send({ active: true }).expect(200);
    expect(back.body.active).toBe(true);
    await login(t.app, 'temp.op', 'temp-pass-1');
  });
});
