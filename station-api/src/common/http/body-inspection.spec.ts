import { describe, expect, it } from 'vitest';
import { allowedOrigins, originAllowed } from '../../config/origins';
import { inspectBody, MAX_BODY_DEPTH } from './body-inspection';

describe('inspectBody', () => {
  it('accepts ordinary bodies, multi-line text and tabs', () => {
    expect(inspectBody({ note: 'line one\nline two\tend', steps: [{ limits: [{ high: 1 }] }] })).toBeNull();
  });

  it('names the field holding a control character', () => {
    // U+0000 NUL and U+001B ESC are C0 control codes (Unicode Standard §23.1)
    expect(inspectBody({ user: { name: 'a\u0000b' } })).toMatchObject({ field: 'user.name', message: expect.stringContaining('U+0000') });
    expect(inspectBody({ list: ['ok', '\u001b[31m'] })?.field).toBe('list[1]');
  });

  it('refuses prototype keys wherever they are', () => {
    expect(inspectBody(JSON.parse('{"a":{"__proto__":{"x":1}}}'))?.field).toBe('a.__proto__');
    expect(inspectBody({ constructor: 1 })?.field).toBe('constructor');
  });

  it('stops at the depth bound without recursing into a 100,000-level body', () => {
    let deep: unknown = 1;
    for (let i = 0; i < 100_000; i++) deep = { a: deep };
    expect(inspectBody(deep)?.message).toMatch(new RegExp(`more than ${MAX_BODY_DEPTH} levels`));
    let ok: unknown = 1;
    for (let i = 0; i < MAX_BODY_DEPTH; i++) ok = { a: ok };
    expect(inspectBody(ok)).toBeNull();
  });
});

describe('originAllowed', () => {
  it('allows no Origin, the same host and listed origins only', () => {
    const listed = allowedOrigins(' http://localhost:5173/ , http://10.0.0.5:3000');
    expect(listed).toEqual(['http://localhost:5173', 'http://10.0.0.5:3000']);
    expect(originAllowed(undefined, 'station:3000', [])).toBe(true);
    expect(originAllowed('http://station:3000', 'station:3000', [])).toBe(true);
    expect(originAllowed('http://localhost:5173', 'localhost:3000', listed)).toBe(true);
    expect(originAllowed('http://evil.example', 'station:3000', listed)).toBe(false);
    expect(originAllowed('not a url', 'station:3000', [])).toBe(false);
  });
});
