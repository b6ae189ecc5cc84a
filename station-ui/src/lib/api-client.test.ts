import { afterEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse } from '@/testing/render';
import { api, ApiError, setUnauthorizedHandler, tokenStore } from './api-client';

afterEach(() => setUnauthorizedHandler(() => {}));

describe('api client', () => {
  it('sends the bearer token and parses JSON', async () => {
    tokenStore.set('abc');
    const fetchMock = vi.fn(async () => jsonResponse(200, { ok: true }));
    vi.stubGlobal('fetch', fetchMock);
    await expect(api.get('/users', { query: { limit: 10, q: '', skip: undefined } })).resolves.toEqual({ ok: true });
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/users?limit=10');
    expect((init.headers as Record<string, string>).Authorization).toBe('Bearer abc');
  });

  it('turns the error shape into an ApiError with message, field problems and code', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () =>
        jsonResponse(400, {
          statusCode: 400,
          error: 'Bad Request',
          message: 'password must be longer than or equal to 8 characters',
          details: [{ field: 'password', problems: ['password must be longer than or equal to 8 characters'] }],
        }),
      ),
    );
    const err = (await api.post('/users', {}).catch((e: unknown) => e)) as ApiError;
    expect(err).toBeInstanceOf(ApiError);
    expect(err.status).toBe(400);
    expect(err.message).toBe('password must be longer than or equal to 8 characters');
    expect(err.fieldProblems).toEqual([{ field: 'password', problems: ['password must be longer than or equal to 8 characters'] }]);
    expect(err.code).toBeUndefined();
  });

  it('reads details.code of a domain refusal', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => jsonResponse(409, { statusCode: 409, error: 'Conflict', message: 'Station busy', details: { code: 'station_busy' } })),
    );
    const err = (await api.post('/stations/1/scan', { serial: 'x' }).catch((e: unknown) => e)) as ApiError;
    expect(err.code).toBe('station_busy');
  });

  it('gives a readable message when the body is not the error shape', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response('<html>Bad gateway</html>', { status: 502 })));
    const err = (await api.get('/users').catch((e: unknown) => e)) as ApiError;
    expect(err.status).toBe(502);
    expect(err.message).toMatch(/station server had a problem \(HTTP 502\)/);
  });

  it('on 401 forgets the token and hands over to the sign-in redirect', async () => {
    tokenStore.set('expired');
    const onUnauthorized = vi.fn();
    setUnauthorizedHandler(onUnauthorized);
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(401, { statusCode: 401, error: 'Unauthorized', message: 'Sign in first' })));
    await expect(api.get('/auth/me')).rejects.toMatchObject({ status: 401 });
    expect(tokenStore.get()).toBeNull();
    expect(onUnauthorized).toHaveBeenCalledTimes(1);
  });

  it('leaves a wrong password at sign-in to the form', async () => {
    const onUnauthorized = vi.fn();
    setUnauthorizedHandler(onUnauthorized);
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(401, { statusCode: 401, error: 'Unauthorized', message: 'no' })));
    await expect(api.post('/auth/login', {}, { skipUnauthorizedRedirect: true })).rejects.toMatchObject({ status: 401 });
    expect(onUnauthorized).not.toHaveBeenCalled();
  });
});
