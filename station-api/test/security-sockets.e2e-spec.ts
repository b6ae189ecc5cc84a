import { JwtService } from '@nestjs/jwt';
import type { AddressInfo } from 'node:net';
import { io, Socket } from 'socket.io-client';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JoinAck } from '../src/realtime/station-events';
import { createTestApp, login, TEST_JWT_SECRET, TestApp } from './create-test-app';

/** Live sockets keep only the rights their token and account still have (issue: sockets outlived their rights). */
describe('socket rights', () => {
  let t: TestApp;
  let url: string;
  let admin: string;
  let stationId: number;
  const sockets: Socket[] = [];
  const http = () => request(t.app.getHttpServer());

  beforeAll(async () => {
    t = await createTestApp();
    await t.app.listen(0, '127.0.0.1');
    url = `http://127.0.0.1:${(t.app.getHttpServer().address() as AddressInfo).port}`;
    admin = await login(t.app, 'admin');
    stationId = (await http().get('/api/stations').set('Authorization', `Bearer ${admin}`)).body[0].id;
  });
  afterAll(async () => {
    for (const s of sockets) s.disconnect();
    await t?.close();
  });

  async function connect(token: string, extraHeaders?: Record<string, string>): Promise<Socket> {
    const s = io(url, { auth: { token }, transports: ['websocket'], reconnection: false, forceNew: true, extraHeaders });
    sockets.push(s);
    await new Promise<void>((resolve, reject) => {
      s.once('connect', () => resolve());
      s.once('connect_error', (e) => reject(e));
    });
    return s;
  }

  /** Resolves with the auth:error message and the disconnect, or rejects after ms. */
  function ended(s: Socket, ms: number): Promise<string> {
    return new Promise((resolve, reject) => {
      let message = '';
      const timer = setTimeout(() => reject(new Error(`socket still open after ${ms} ms`)), ms);
      s.on('auth:error', (p: { message: string }) => (message = p.message));
      s.once('disconnect', () => {
        clearTimeout(timer);
        resolve(message);
      });
    });
  }

  async function newUser(username: string, roles: string[]): Promise<{ id: number; token: string }> {
    const res = await http().post('/api/users').set('Authorization', `Bearer ${admin}`)
      .send({ username, displayName: username, password: `${username}-pass-1`, roles }).expect(201);
    return { id: res.body.id, token: await login(t.app, username, `${username}-pass-1`) };
  }

  it('lets the testing roles join an existing station room, and refuses quality and a station that does not exist', async () => {
    for (const role of ['operator', 'engineer', 'admin']) {
      const s = await connect(await login(t.app, role));
      expect(await s.emitWithAck('station:join', { stationId })).toEqual({ ok: true, room: `station:${stationId}` });
      const missing = (await s.emitWithAck('station:join', { stationId: 999 })) as JoinAck;
      expect(missing).toEqual({ ok: false, message: 'There is no station with id 999.' });
      s.disconnect();
    }
    const quality = await connect(await login(t.app, 'quality'));
    const refused = (await quality.emitWithAck('station:join', { stationId })) as JoinAck;
    expect(refused.ok).toBe(false);
    expect((refused as { message: string }).message).toMatch(/roles operator, engineer, admin/);
    expect(await quality.emitWithAck('board:join', {})).toEqual({ ok: true, room: 'board' });
  });

  it('closes a socket when its token expires, with auth:error first', async () => {
    const operatorId = (await http().get('/api/auth/me').set('Authorization', `Bearer ${await login(t.app, 'operator')}`)).body.id;
    const shortLived = new JwtService({ secret: TEST_JWT_SECRET }).sign({ sub: operatorId, username: 'operator', roles: ['operator'] }, { expiresIn: 2 });
    const s = await connect(shortLived);
    expect((await s.emitWithAck('station:join', { stationId })).ok).toBe(true);
    expect(await ended(s, 5_000)).toMatch(/expired/);
  });

  it('closes a socket when its user is deactivated', async () => {
    const u = await newUser('sock-leaver', ['operator']);
    const s = await connect(u.token);
    expect((await s.emitWithAck('station:join', { stationId })).ok).toBe(true);
    const closed = ended(s, 3_000);
    await http().patch(`/api/users/${u.id}`).set('Authorization', `Bearer ${admin}`).send({ active: false }).expect(200);
    expect(await closed).toMatch(/deactivated/);
  });

  it('closes a station socket when its user loses the role, and re-checks rights on the next join', async () => {
    const u = await newUser('sock-mover', ['engineer']);
    const s = await connect(u.token);
    expect((await s.emitWithAck('station:join', { stationId })).ok).toBe(true);
    const closed = ended(s, 3_000);
    await http().patch(`/api/users/${u.id}`).set('Authorization', `Bearer ${admin}`).send({ roles: ['quality'] }).expect(200);
    expect(await closed).toMatch(/roles have changed/);
    // a new socket with the old token (roles claim still "engineer") is judged by the current roles
    const again = await connect(u.token);
    expect((await again.emitWithAck('station:join', { stationId })).ok).toBe(false);
  });

  it('a board display token joins the board only', async () => {
    const res = await http().post('/api/auth/board-token').set('Authorization', `Bearer ${admin}`).send({ label: 'Hall 2 wall' }).expect(201);
    const s = await connect(res.body.token);
    expect(await s.emitWithAck('board:join', {})).toEqual({ ok: true, room: 'board' });
    expect((await s.emitWithAck('station:join', { stationId })).ok).toBe(false);
  });

  it('refuses a browser origin that is not configured', async () => {
    const token = await login(t.app, 'operator');
    await expect(connect(token, { Origin: 'http://evil.example' })).rejects.toThrow();
    const ok = await connect(token, { Origin: url });
    expect(ok.connected).toBe(true);
  });
});
