import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, TestApp } from './create-test-app';

describe('station server skeleton', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => t?.close());

  it('answers an unknown API route with the JSON error shape, not a 500', async () => {
    const res = await request(t.app.getHttpServer()).get('/api/no-such-route').expect(404);
    expect(res.body).toMatchObject({ statusCode: 404, error: 'Not Found' });
  });

  it('serves the OpenAPI document', async () => {
    const res = await request(t.app.getHttpServer()).get('/api/docs/openapi.json').expect(200);
    expect(res.body.info.title).toBe('Railwright station API');
  });
});
