import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';
import { appRoutes, fillPath, tableFingerprints } from './security-routes';

interface Case {
  route: string;
  name: string;
  url: string;
  method: string;
  contentType?: string;
  body: string | Buffer;
}

type Schema = { $ref?: string; type?: string; properties?: Record<string, Schema>; required?: string[]; items?: Schema };

const deep = (levels: number) => '{"a":'.repeat(levels) + '1' + '}'.repeat(levels);
const MB_STRING = 'x'.repeat(1024 * 1024);

/** Values that are wrong for any field, whatever its type. */
const WRONG_VALUES: [string, string][] = [
  ['null', 'null'],
  ['object', '{"nested":{"x":1}}'],
  ['array', '[1,2,3]'],
  ['huge number', '1e308'],
  ['negative number', '-1'],
  ['non-integer', '0.5'],
  ['boolean', 'true'],
  ['empty string', '""'],
  ['NUL byte', '"abc\\u0000def"'],
  ['escape control', '"\\u001b[31mred"'],
  ['1 MB string', JSON.stringify(MB_STRING)],
  ['SQL fragment', JSON.stringify("x'); DROP TABLE users; --")],
  ['script fragment', JSON.stringify('<script>alert(1)</script>')],
  ['path traversal', JSON.stringify('../../../../etc/passwd')],
];

/**
 * Malformed requests generated across every write route, with UI_DIST set as npm start sets it (the
 * real server process serving the UI is checked in startup.e2e-spec.ts): 0 × 5xx, a message on every 4xx,
 * and nothing written (row count and content hash of every table).
 */
describe('malformed requests against every write route', () => {
  let t: TestApp;
  let admin: string;
  const cases: Case[] = [];

  beforeAll(async () => {
    const ui = mkdtempSync(join(tmpdir(), 'railwright-ui-'));
    writeFileSync(join(ui, 'index.html'), '<!doctype html><title>ui</title>');
    t = await createTestApp({ UI_DIST: ui });
    admin = await login(t.app, 'admin');
    const doc = (await request(t.app.getHttpServer()).get('/api/docs/openapi.json').expect(200)).body as {
      paths: Record<string, Record<string, { requestBody?: { content: Record<string, { schema: Schema }> } }>>;
      components: { schemas: Record<string, Schema> };
    };
    const resolve = (s: Schema | undefined): Schema | undefined => (s?.$ref ? doc.components.schemas[s.$ref.split('/').pop()!] : s);
    for (const r of appRoutes(t.app).filter((x) => x.method !== 'GET')) {
      // ids and serials that do not exist: a body that passes validation still changes nothing (404)
      const url = fillPath(r.path, { id: '999999', serial: 'OB-NOSUCH-99999' });
      const base = { route: r.key, url, method: r.method.toLowerCase() };
      const add = (name: string, body: string | Buffer, contentType = 'application/json') => cases.push({ ...base, name, body, contentType });
      add('invalid JSON', '{"a": ');
      add('truncated JSON', '{"a": "b"');
      add('NaN literal', '{"a": NaN}');
      add('single quotes', "{'a': 1}");
      add('top-level string', '"just text"');
      add('top-level number', '42');
      add('top-level array', '[]');
      add('empty object', '{}');
      add('nested 5,000 deep', deep(5000));
      add('nested 40 deep', deep(40));
      add('__proto__ key', '{"__proto__": {"admin": true}}');
      add('constructor key', '{"constructor": {"prototype": {"x": 1}}}');
      add('unknown field', '{"zzUnknown": 1}');
      add('NUL in a key', '{"a\\u0000b": 1}');
      add('body over 100 kB', JSON.stringify({ a: MB_STRING }));
      add('text/plain', 'hello', 'text/plain');
      add('XML', '<user><displayName>x</displayName></user>', 'application/xml');
      add('form-encoded', 'displayName=x&active=false', 'application/x-www-form-urlencoded');
      add('JSON labelled as text', '{"displayName":"x"}', 'text/plain');
      add('no content type', '{"displayName":"x"}', '');
      add('UTF-16 charset', '{"a":1}', 'application/json; charset=utf-16');
      const op = doc.paths[r.path.replace(/:([A-Za-z]+)/g, '{$1}')]?.[base.method];
      const schema = resolve(op?.requestBody?.content['application/json']?.schema);
      for (const [field, prop] of Object.entries(schema?.properties ?? {})) {
        const required = schema?.required ?? [];
        // text fragments are acceptable text; they are only sent where the body is refused anyway
        // (another required field missing, or an id that does not exist)
        const onlyRequired = required.length === 1 && required[0] === field && !r.path.includes(':');
        for (const [name, json] of WRONG_VALUES) {
          if (onlyRequired && ['SQL fragment', 'script fragment', 'path traversal'].includes(name) && prop.type === 'string') continue;
          add(`${field}: ${name}`, `{${JSON.stringify(field)}: ${json}}`);
        }
      }
    }
  });
  afterAll(() => t?.close());

  it('answers every one with a 4xx and a message, and writes nothing', { timeout: 180_000 }, async () => {
    const before = await tableFingerprints(t.orm);
    const fivexx: string[] = [];
    const silent: string[] = [];
    const statuses: Record<number, number> = {};
    for (const c of cases) {
      let req = request(t.app.getHttpServer())[c.method as 'post'](c.url).set('Authorization', `Bearer ${admin}`);
      if (c.contentType) req = req.set('Content-Type', c.contentType);
      const res = await req.send(c.body as string);
      statuses[res.status] = (statuses[res.status] ?? 0) + 1;
      if (res.status >= 500) fivexx.push(`${c.route} ${c.name}: ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
      if (res.status >= 400 && !(typeof res.body?.message === 'string' && res.body.message.length > 5)) silent.push(`${c.route} ${c.name}: ${res.status} ${res.text.slice(0, 80)}`);
      // the plan checker answers 200 with its findings: a report, not an acceptance
      const reported = c.route === 'POST /api/plans/validate' && res.body?.valid === false && res.body.errors?.length > 0;
      if (res.status < 400 && !reported) silent.push(`${c.route} ${c.name}: accepted with ${res.status}`);
    }
    const after = await tableFingerprints(t.orm);
    console.info(`malformed requests: ${cases.length} tried over ${new Set(cases.map((c) => c.route)).size} write routes; 5xx: ${fivexx.length}; statuses ${JSON.stringify(statuses)}`);
    expect(cases.length).toBeGreaterThanOrEqual(300);
    expect(fivexx).toEqual([]);
    expect(silent).toEqual([]);
    // failed sign-ins are audited by design; no case here signs in (the password is always missing)
    expect(after).toEqual(before);
  });
});
