import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, TestApp } from './create-test-app';

// Separate file (own process, own app) because the limit is read once when the app module loads.
const LIMIT = 3;

describe('sign-in throttling', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ LOGIN_ATTEMPTS_PER_MINUTE: String(LIMIT) });
  });
  afterAll(async () => t?.close());

  it(`allows ${LIMIT} attempts a minute, then answers 429 saying when to retry`, async () => {
    const http = request(t.app.getHttpServer());
    const first = await http.post('/api/auth/login').send({ username: 'engineer', password: 'engineer-demo' }).expect(200);
    for (let i = 1; i < LIMIT; i++) await http.post('/api/auth/login').send({ username: 'engineer', password: 'wrong-password' }).expect(401);

    const res = await http.post('/api/auth/login').send({ username: 'engineer', password: 'engineer-demo' }).expect(429);
    expect(res.body).toMatchObject({
      statusCode: 429,
      error: 'Too Many Requests',
      message: expect.stringMatching(/Try again in \d+ s/),
      details: { code: 'too_many_attempts', retryAfterS: expect.any(Number) },
    });
    expect(res.body.details.retryAfterS).toBeGreaterThan(0);
    expect(res.body.details.retryAfterS).toBeLessThanOrEqual(60);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);

    // other routes are not rate limited: the token from before keeps working, many times over
    for (let i = 0; i < 3 * LIMIT; i++) {
      await http.get('/api/products').set('Authorization', `Bearer ${first.body.accessToken}`).expect(200);
    }
    await http.get('/api/auth/me').set('Authorization', `Bearer ${first.body.accessToken}`).expect(200);
  });
});
