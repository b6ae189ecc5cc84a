import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';

/**
 * The audit trail page's API: filters, text search, CSV export, plain words for the actions, links, role rules,
 * and that nothing (no route, no SQL) can change or remove a record.
 */
describe('audit trail: GET /api/audit', () => {
  let t: TestApp;
  const tok: Record<string, string> = {};
  const http = () => request(t.app.getHttpServer());
  const get = (role: string, query: Record<string, string | number> = {}) => http().get('/api/audit').set('Authorization', `Bearer ${tok[role]}`).query(query);
  let draftId: number;
  let planCode: string;
  let draftVersion: number;
  let userId: number;

  beforeAll(async () => {
    t = await createTestApp();
    for (const role of ['operator', 'engineer', 'engineer2', 'quality', 'admin']) tok[role] = await login(t.app, role);
    const as = (role: string) => ({ Authorization: `Bearer ${tok[role]}` });
    // a limit change in a draft: the words must name the limit with its units
    const plans = (await http().get('/api/plans').set(as('engineer')).expect(200)).body;
    const plan = plans.find((p: { product: { partNumber: string } }) => p.product.partNumber === 'OB-BK0503');
    planCode = plan.code;
    const draft = (await http().post(`/api/plan-versions/${plan.releasedVersion.id}/drafts`).set(as('engineer')).send({ reason: 'Limit review' }).expect(201)).body;
    draftId = draft.id;
    draftVersion = draft.version;
    const steps = structuredClone(draft.steps);
    steps[2].limits[0].high = 5.08;
    await http().patch(`/api/plan-versions/${draft.id}`).set(as('engineer')).send({ steps, reason: 'tighter vout after pilot =SUM(A1)' }).expect(200);
    const user = (await http().post('/api/users').set(as('admin')).send({ username: 'n.okafor', displayName: 'Nia Okafor', password: 'long-enough-pass-123', roles: ['operator'] }).expect(201)).body;
    userId = user.id;
    await http().patch(`/api/users/${user.id}`).set(as('admin')).send({ displayName: 'Nia Okafor-Reyes', roles: ['operator', 'quality'] }).expect(200);
  });
  afterAll(async () => t?.close());

  it('opens to engineer, quality and admin; refuses operators and strangers', async () => {
    for (const role of ['engineer', 'quality', 'admin']) await get(role).expect(200);
    await get('operator').expect(403);
    await http().get('/api/audit').expect(401);
    await http().get('/api/audit/export').set('Authorization', `Bearer ${tok.operator}`).expect(403);
  });

  it('says what happened in plain words, with the limit named and units kept', async () => {
    const res = await get('engineer', { entityType: 'plan_version', entityId: String(draftId) }).expect(200);
    const edit = res.body.items.find((e: { action: string }) => e.action === 'plan_version.edited');
    expect(edit.what).toMatch(new RegExp(`^Changed the high limit of .+ in ${planCode} version ${draftVersion} from 5\\.1 V to 5\\.08 V$`));
    expect(edit.changes[0]).toMatchObject({ before: '5.1 V', after: '5.08 V' });
    expect(edit.changes[0].field).toMatch(/^High limit of /);
    expect(edit.link).toMatchObject({ kind: 'plan_version', id: String(draftId), planId: expect.any(Number) });
    const created = res.body.items.find((e: { action: string }) => e.action === 'plan_version.created');
    expect(created.what).toBe(`Started ${planCode} version ${draftVersion} as a draft from version ${draftVersion - 1}`);
    // seeded releases
    const released = (await get('quality', { action: 'plan_version.released' }).expect(200)).body.items[0];
    expect(released.what).toMatch(/^Released plan [A-Z0-9-]+ version \d+$/);
  });

  it('puts user changes into words, field by field, without secrets', async () => {
    const res = await get('admin', { entityType: 'user', entityId: String(userId) }).expect(200);
    const updated = res.body.items.find((e: { action: string }) => e.action === 'user.updated');
    expect(updated.what).toBe('Changed user n.okafor');
    expect(updated.changes).toEqual(
      expect.arrayContaining([
        { field: 'Display name', before: 'Nia Okafor', after: 'Nia Okafor-Reyes' },
        { field: 'Roles', before: 'operator', after: 'operator, quality' },
      ]),
    );
    expect(updated.link).toMatchObject({ kind: 'user', id: String(userId), label: 'n.okafor' });
    expect(JSON.stringify(res.body)).not.toMatch(/password_?hash|argon/i);
  });

  it('filters by person, date range and text (case-insensitive, % is literal)', async () => {
    const byEngineer = (await get('quality', { user: 'ENGINEER', limit: 500 }).expect(200)).body;
    expect(byEngineer.total).toBeGreaterThanOrEqual(2);
    expect(byEngineer.items.every((e: { actorName: string }) => e.actorName === 'engineer')).toBe(true);
    const search = (await get('quality', { q: 'TIGHTER VOUT' }).expect(200)).body;
    expect(search.items.map((e: { action: string }) => e.action)).toEqual(['plan_version.edited']);
    // partial text inside the before/after
    expect((await get('quality', { q: 'okafor-re' }).expect(200)).body.total).toBe(1);
    expect((await get('quality', { q: '100%' }).expect(200)).body.total).toBe(0);
    const future = new Date(Date.now() + 86_400_000).toISOString();
    expect((await get('quality', { from: future }).expect(200)).body.total).toBe(0);
    const past = new Date(Date.now() - 3_600_000).toISOString();
    const all = (await get('admin', { from: past, to: future }).expect(200)).body.total;
    expect(all).toBe((await get('admin').expect(200)).body.total);
  });

  it('pages newest first', async () => {
    const p1 = (await get('admin', { limit: 2, offset: 0 }).expect(200)).body;
    const p2 = (await get('admin', { limit: 2, offset: 2 }).expect(200)).body;
    expect(p1.items).toHaveLength(2);
    expect(p1.total).toBe(p2.total);
    expect(p1.items[1].at >= p2.items[0].at).toBe(true);
    expect(p1.items.map((e: { id: number }) => e.id)).not.toContain(p2.items[0].id);
  });

  it('refuses bad filters with a message a person can act on', async () => {
    const badDate = await get('quality', { from: '2026-13-45' }).expect(400);
    expect(badDate.body.message).toMatch(/from must be a date and time in ISO 8601/);
    const reversed = await get('quality', { from: '2026-12-02T00:00:00Z', to: '2026-12-01T00:00:00Z' }).expect(400);
    expect(reversed.body.message).toMatch(/starts .* after it ends/);
    const nobody = await get('quality', { user: 'ghost' }).expect(400);
    expect(nobody.body.message).toMatch(/Nobody signs in as "ghost"/);
    const type = await get('quality', { entityType: 'spaceship' }).expect(400);
    expect(type.body.message).toMatch(/not a kind of object/);
    await get('quality', { limit: 0 }).expect(400);
    await get('quality', { limit: 501 }).expect(400);
    await get('quality', { action: 'DROP TABLE' }).expect(400);
    await get('quality', { surprise: 1 }).expect(400);
  });

  it('shows sign-ins to administrators only', async () => {
    expect((await get('admin', { action: 'auth.login' }).expect(200)).body.total).toBeGreaterThan(0);
    expect((await get('quality', { action: 'auth.login' }).expect(200)).body.total).toBe(0);
  });

  it('exports the same filtered set as CSV, quoted per RFC 4180, with formulas neutralised', async () => {
    const res = await http().get('/api/audit/export').set('Authorization', `Bearer ${tok.quality}`).query({ entityType: 'plan_version', entityId: String(draftId) }).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="audit-trail.csv"/);
    const lines = res.text.split('\r\n');
    expect(lines[0]).toBe('When (UTC),Who,What,Why,Changes,Object type,Object,Action code,Record id');
    expect(lines.at(-1)).toBe('');
    expect(lines).toHaveLength(2 + 2); // header, edited, created, trailing CRLF
    // OWASP CSV Injection: a reason starting with = is prefixed with a single quote
    expect(res.text).toContain("tighter vout after pilot =SUM(A1)");
    const listed = (await get('quality', { entityType: 'plan_version', entityId: String(draftId) }).expect(200)).body;
    expect(listed.total).toBe(2);
    await http().get('/api/audit/export').set('Authorization', `Bearer ${tok.quality}`).query({ user: 'ghost' }).expect(400);
  });

  it('quotes a reason that starts with a formula sign', async () => {
    const as = { Authorization: `Bearer ${tok.engineer}` };
    const plans = (await http().get('/api/plans').set(as).expect(200)).body;
    const plan = plans.find((p: { product: { partNumber: string } }) => p.product.partNumber === 'OB-BK1202');
    const draft = (await http().post(`/api/plan-versions/${plan.releasedVersion.id}/drafts`).set(as).send({ reason: '=HYPERLINK("http://x","click"), next' }).expect(201)).body;
    const res = await http().get('/api/audit/export').set('Authorization', `Bearer ${tok.quality}`).query({ entityType: 'plan_version', entityId: String(draft.id) }).expect(200);
    expect(res.text).toContain(`"'=HYPERLINK(""http://x"",""click""), next"`);
  });

  it('offers the object types and people that appear in the trail', async () => {
    const res = await http().get('/api/audit/choices').set('Authorization', `Bearer ${tok.engineer}`).expect(200);
    expect(res.body.entityTypes).toEqual(expect.arrayContaining([{ type: 'plan_version', words: 'plan version' }, { type: 'user', words: 'user' }]));
    expect(res.body.users.map((u: { username: string }) => u.username)).toEqual(expect.arrayContaining(['admin', 'engineer']));
    expect(JSON.stringify(res.body)).not.toMatch(/hash/i);
  });

  describe('no route edits or deletes a record', () => {
    for (const method of ['put', 'patch', 'delete', 'post'] as const) {
      for (const path of ['/api/audit', '/api/audit/1']) {
        it(`${method.toUpperCase()} ${path} is not a route`, async () => {
          const res = await http()[method](path).set('Authorization', `Bearer ${tok.admin}`).send({ reason: 'tidy up' });
          expect([404, 405]).toContain(res.status);
        });
      }
    }

    it('the table itself refuses UPDATE and DELETE (Migration20261202156000 triggers)', async () => {
      const conn = t.orm.em.fork().getConnection();
      const [before] = await conn.execute('select count(*) as n, max(id) as last from audit_events');
      await expect(conn.execute(`update audit_events set reason = 'rewritten' where id = ?`, [before.last])).rejects.toThrow(/audit records cannot be changed/);
      await expect(conn.execute('delete from audit_events')).rejects.toThrow(/audit records cannot be deleted/);
      const [after] = await conn.execute('select count(*) as n from audit_events');
      expect(after.n).toBe(before.n);
      const [row] = await conn.execute('select reason from audit_events where id = ?', [before.last]);
      expect(row.reason).not.toBe('rewritten');
    });
  });
});
