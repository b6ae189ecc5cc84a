import { JwtService } from '@nestjs/jwt';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROUTE_POLICY } from '../src/common/route-policy';
import { ROLES } from '../src/users/user.entity';
import { createTestApp, login, TEST_JWT_SECRET, TestApp } from './create-test-app';
import { appRoutes, AppRoute, expressApiRouteKeys, fillPath } from './security-routes';

type Identity = (typeof ROLES)[number] | 'none' | 'forged' | 'alg-none' | 'expired' | 'board';
const IDENTITIES: Identity[] = ['none', 'forged', 'alg-none', 'expired', ...ROLES, 'board'];

/** 'ok' = the route let the caller in: any answer but 401/403, and never 5xx. */
type Expected = 401 | 403 | 'ok';

/** The cell as the ONE policy table (src/common/route-policy.ts) says it must be. */
function expected(key: string, who: Identity): Expected {
  const policy = ROUTE_POLICY[key];
  if (policy.allow === 'public') return 'ok';
  if (who === 'none' || who === 'forged' || who === 'alg-none' || who === 'expired') return 401;
  if (who === 'board') return policy.boardDisplay ? 'ok' : 403;
  return policy.allow.includes(who) ? 'ok' : 403;
}

const b64 = (o: object) => Buffer.from(JSON.stringify(o)).toString('base64url');

/**
 * Route × identity matrix generated from the application's own route table: every controller route
 * against every role, no token, a forged signature, alg "none", an expired token and a board display token.
 */
describe('route × role matrix', () => {
  let t: TestApp;
  let routes: AppRoute[];
  const tokens: Partial<Record<Identity, string>> = {};

  beforeAll(async () => {
    t = await createTestApp();
    routes = appRoutes(t.app);
    for (const role of ROLES) tokens[role] = await login(t.app, role);
    const adminClaims = { sub: 1, username: 'admin', roles: ['admin'] };
    tokens.forged = new JwtService({ secret: 'another-server-secret-0123456789abcdef' }).sign(adminClaims);
    tokens['alg-none'] = `${b64({ alg: 'none', typ: 'JWT' })}.${b64({ ...adminClaims, iat: Math.floor(Date.now() / 1000) })}.`;
    tokens.expired = new JwtService({ secret: TEST_JWT_SECRET }).sign({ ...adminClaims, iat: Math.floor(Date.now() / 1000) - 7200 }, { expiresIn: 3600 });
    tokens.board = (await request(t.app.getHttpServer()).post('/api/auth/board-token').set('Authorization', `Bearer ${tokens.admin}`).send({ label: 'matrix wall' })).body.token;
  });
  afterAll(() => t?.close());

  it('reads the routes from the application and finds every one in the Express router', () => {
    expect(routes.length).toBeGreaterThan(30);
    expect(routes.map((r) => r.key).sort()).toEqual(expressApiRouteKeys(t.app));
  });

  it('has a role declaration on every route and a policy entry that says the same', () => {
    const problems: string[] = [];
    for (const r of routes) {
      const policy = ROUTE_POLICY[r.key];
      if (!policy) problems.push(`${r.key}: missing from ROUTE_POLICY (src/common/route-policy.ts)`);
      if (!r.isPublic && !(r.roles && r.roles.length > 0)) problems.push(`${r.key}: declares neither @Roles nor @Public`);
      if (!policy) continue;
      if (policy.allow === 'public') {
        if (!r.isPublic) problems.push(`${r.key}: public in the policy but not @Public()`);
      } else if (r.isPublic || [...(r.roles ?? [])].sort().join() !== [...policy.allow].sort().join()) {
        problems.push(`${r.key}: @Roles(${r.roles?.join(', ')}) but the policy says ${policy.allow.join(', ')}`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('answers every cell as the policy table says', async () => {
    const wrong: string[] = [];
    let cells = 0;
    for (const r of routes.filter((x) => ROUTE_POLICY[x.key])) {
      for (const who of IDENTITIES) {
        const url = fillPath(r.path, { id: '1', serial: 'OB-NOSUCH-00001' });
        let req = request(t.app.getHttpServer())[r.method.toLowerCase() as 'get'](url);
        if (who !== 'none') req = req.set('Authorization', `Bearer ${tokens[who]}`);
        if (r.method !== 'GET') req = req.set('Content-Type', 'application/json').send('{}');
        const res = await req;
        cells++;
        const want = expected(r.key, who);
        const ok = want === 'ok' ? res.status !== 401 && res.status !== 403 && res.status < 500 : res.status === want;
        if (!ok) wrong.push(`${r.key} as ${who}: expected ${want}, got ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`);
        if (res.status >= 400 && !(typeof res.body?.message === 'string' && res.body.message.length > 0)) wrong.push(`${r.key} as ${who}: ${res.status} without a message`);
      }
    }
    expect(wrong).toEqual([]);
    // figure recorded in docs/reliability.md
    console.info(`route matrix: ${routes.length} routes × ${IDENTITIES.length} identities = ${cells} cells`);
    expect(cells).toBe(routes.filter((x) => ROUTE_POLICY[x.key]).length * IDENTITIES.length);
  });
});
