import type { AddressInfo } from 'node:net';
import { io } from 'socket.io-client';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, login, TestApp } from './create-test-app';
import { EngineHarness } from './engine-helpers';

/** Responses are gzip'ed when the client asks, without breaking socket.io or the PDF repair tags. */
describe('response compression', () => {
  let t: TestApp;
  let h: EngineHarness;
  let url: string;

  beforeAll(async () => {
    t = await createTestApp();
    await t.app.listen(0, '127.0.0.1');
    url = `http://127.0.0.1:${(t.app.getHttpServer().address() as AddressInfo).port}`;
    h = new EngineHarness(t, await login(t.app, 'engineer'));
  });
  afterAll(async () => {
    await t?.close();
  });

  it('gzips a large JSON response when asked, and sends it plain when not', async () => {
    const zipped = await request(url).get('/api/plans').set('Authorization', `Bearer ${h.token}`).set('Accept-Encoding', 'gzip').expect(200);
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers['content-type']).toMatch(/^application\/json/);
    // decoded by the client into the same JSON
    expect(Array.isArray(zipped.body) || Array.isArray(zipped.body.items)).toBe(true);
    expect(JSON.stringify(zipped.body).length).toBeGreaterThan(1024);

    const plain = await request(url).get('/api/plans').set('Authorization', `Bearer ${h.token}`).set('Accept-Encoding', 'identity').expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body).toEqual(zipped.body);
  });

  it('leaves the PDF repair tag as it is', async () => {
    const station = await h.station('EOL-1');
    const [serial] = await h.freshSerials('EOL-1', 1);
    await h.simulate('FX-101', { serials: { [serial]: 'wrong_feedback' } });
    const r = await h.run(station.id, serial);
    expect(r.verdict).toBe('fail');
    const pdf = await request(url)
      .get(`/api/runs/${r.runId}/repair-tag.pdf`)
      .set('Authorization', `Bearer ${h.token}`)
      .set('Accept-Encoding', 'gzip')
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(pdf.headers['content-encoding']).toBeUndefined();
    expect((pdf.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
  });

  it('keeps socket.io working (websocket and long-polling)', async () => {
    for (const transports of [['websocket'], ['polling']]) {
      const socket = io(url, { auth: { token: h.token }, transports, reconnection: false, forceNew: true });
      try {
        await new Promise<void>((resolve, reject) => {
          socket.once('connect', resolve);
          socket.once('connect_error', reject);
        });
        expect(await socket.emitWithAck('board:join', {})).toEqual({ ok: true, room: 'board' });
      } finally {
        socket.disconnect();
      }
    }
  });
});
