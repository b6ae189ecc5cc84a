import { EntityManager } from '@mikro-orm/sqlite';
import { Logger, OnModuleDestroy } from '@nestjs/common';
import {
  ConnectedSocket,
  MessageBody,
  OnGatewayConnection,
  OnGatewayDisconnect,
  OnGatewayInit,
  SubscribeMessage,
  WebSocketGateway,
} from '@nestjs/websockets';
import type { IncomingMessage } from 'node:http';
import type { Server, Socket } from 'socket.io';
import { AuthService } from '../auth/auth.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { SOCKET_POLICY } from '../common/route-policy';
import { allowedOrigins, originAllowed } from '../config/origins';
import { Station } from '../stations/station.entity';
import { UserAccessEvents } from '../users/user-access.events';
import { AuthErrorPayload, BOARD_ROOM, JoinAck, stationRoom } from './station-events';
import { StationEventsPublisher } from './station-events.publisher';

type SocketUser = AuthUser & { expiresAtMs: number };

/** The token, from `auth: {token}` (the documented way) or an `Authorization: Bearer` header. */
function tokenOf(socket: Socket): string | undefined {
  const fromAuth = (socket.handshake.auth as Record<string, unknown> | undefined)?.token;
  if (typeof fromAuth === 'string' && fromAuth) return fromAuth.replace(/^Bearer\s+/i, '');
  const header = socket.handshake.headers.authorization;
  if (typeof header === 'string' && /^Bearer\s+/i.test(header)) return header.replace(/^Bearer\s+/i, '');
  return undefined;
}

function refusalMessage(err: unknown): string {
  const resp = (err as { getResponse?: () => unknown })?.getResponse?.();
  if (resp && typeof resp === 'object' && typeof (resp as { message?: unknown }).message === 'string') {
    return (resp as { message: string }).message;
  }
  return err instanceof Error ? err.message : 'Sign in again to receive live updates.';
}

function stationIdOf(body: unknown): number | string {
  const id = (body as { stationId?: unknown } | null)?.stationId;
  if (typeof id === 'number' && Number.isInteger(id) && id > 0 && id <= 2_147_483_647) return id;
  const shown = JSON.stringify(id ?? null) ?? 'nothing';
  return `stationId must be a positive whole number, got ${shown.length > 40 ? `${shown.slice(0, 40)}…` : shown}`;
}

/** Browsers from another origin are refused at the handshake unless CORS_ORIGINS lists them. */
function allowRequest(req: IncomingMessage, callback: (err: string | null | undefined, success: boolean) => void): void {
  callback(null, originAllowed(req.headers.origin, req.headers.host, allowedOrigins(process.env.CORS_ORIGINS ?? '')));
}

/** Longest a timer may wait (setTimeout's limit is 2^31 - 1 ms, Node.js timers documentation); longer tokens are re-armed. */
const MAX_TIMER_MS = 2_147_483_647;

/**
 * Live station events over socket.io, on the HTTP server's port. Every connection is signed in: the
 * access token is checked during the handshake (refused with a readable `connect_error`). Rights are
 * checked again on every join; a socket is closed (after `auth:error`) when its token expires, or when
 * its user is deactivated or loses the role its rooms need.
 */
@WebSocketGateway({
  cors: { origin: (origin: string | undefined, cb: (err: Error | null, ok?: boolean) => void) => cb(null, !origin || allowedOrigins(process.env.CORS_ORIGINS ?? '').includes(origin)) },
  allowRequest,
})
export class StationEventsGateway implements OnGatewayInit, OnGatewayConnection, OnGatewayDisconnect, OnModuleDestroy {
  private readonly logger = new Logger(StationEventsGateway.name);
  private server?: Server;
  private readonly expiryTimers = new Map<string, NodeJS.Timeout>();
  private readonly stopListening: () => void;

  constructor(
    private readonly auth: AuthService,
    private readonly publisher: StationEventsPublisher,
    private readonly em: EntityManager,
    access: UserAccessEvents,
  ) {
    this.stopListening = access.onChanged((userId) => void this.recheckUser(userId));
  }

  afterInit(server: Server): void {
    this.server = server;
    this.publisher.bind(server);
    // refusing here means a bad token never gets a connected socket; the client sees connect_error(message)
    server.use((socket, next) => {
      this.auth
        .verifyAccessToken(tokenOf(socket))
        .then((user) => {
          socket.data.user = user;
          next();
        })
        .catch((err) => {
          const e = new Error(refusalMessage(err)) as Error & { data?: unknown };
          e.data = { code: 'unauthorized' };
          next(e);
        });
    });
  }

  async handleConnection(socket: Socket): Promise<void> {
    if (!socket.data.user) {
      try {
        socket.data.user = await this.auth.verifyAccessToken(tokenOf(socket));
      } catch (err) {
        return this.endSession(socket, refusalMessage(err));
      }
    }
    this.armExpiry(socket);
  }

  handleDisconnect(socket: Socket): void {
    clearTimeout(this.expiryTimers.get(socket.id));
    this.expiryTimers.delete(socket.id);
  }

  onModuleDestroy(): void {
    this.stopListening();
    for (const t of this.expiryTimers.values()) clearTimeout(t);
    this.expiryTimers.clear();
  }

  @SubscribeMessage('station:join')
  async joinStation(@ConnectedSocket() socket: Socket, @MessageBody() body: unknown): Promise<JoinAck> {
    const id = stationIdOf(body);
    if (typeof id === 'string') return { ok: false, message: id };
    const user = await this.currentRights(socket);
    if (!user) return { ok: false, message: 'Your session has ended. Sign in again.' };
    if (!SOCKET_POLICY.stationRoom.some((r) => user.roles.includes(r))) {
      return { ok: false, message: `Watching a station needs one of the roles ${SOCKET_POLICY.stationRoom.join(', ')}; use the board instead.` };
    }
    if ((await this.em.fork().count(Station, { id })) === 0) return { ok: false, message: `There is no station with id ${id}.` };
    const room = stationRoom(id);
    await socket.join(room);
    // replay the station's current state so the screen can render at once
    const last = this.publisher.lastStateOf(id);
    if (last) socket.emit('station:state', last);
    this.logger.debug(`${user.username} joined ${room}`);
    return { ok: true, room };
  }

  @SubscribeMessage('station:leave')
  async leaveStation(@ConnectedSocket() socket: Socket, @MessageBody() body: unknown): Promise<JoinAck> {
    const id = stationIdOf(body);
    if (typeof id === 'string') return { ok: false, message: id };
    await socket.leave(stationRoom(id));
    return { ok: true, room: stationRoom(id) };
  }

  @SubscribeMessage('board:join')
  async joinBoard(@ConnectedSocket() socket: Socket): Promise<JoinAck> {
    const user = await this.currentRights(socket);
    if (!user) return { ok: false, message: 'Your session has ended. Sign in again.' };
    if (user.scope !== 'board' && !SOCKET_POLICY.boardRoom.some((r) => user.roles.includes(r))) {
      return { ok: false, message: 'Your account has no role that may watch the board.' };
    }
    await socket.join(BOARD_ROOM);
    for (const state of this.publisher.allLastStates()) socket.emit('station:state', state);
    return { ok: true, room: BOARD_ROOM };
  }

  /**
   * Re-reads the socket's rights (account still active, current roles) before a join. Ends the session
   * and returns null when the token has expired or the account is gone.
   */
  private async currentRights(socket: Socket): Promise<SocketUser | null> {
    const user = socket.data.user as SocketUser | undefined;
    if (!user) return null;
    if (Date.now() >= user.expiresAtMs) {
      this.endSession(socket, 'Your session has expired. Sign in again.');
      return null;
    }
    if (user.scope === 'board') return user;
    try {
      const fresh = await this.auth.loadActiveUser(user.id);
      socket.data.user = { ...fresh, expiresAtMs: user.expiresAtMs };
      return socket.data.user as SocketUser;
    } catch (err) {
      this.endSession(socket, refusalMessage(err));
      return null;
    }
  }

  /** Called when an account's rights change: deactivated → closed; a role lost that a joined room needs → closed. */
  private async recheckUser(userId: number): Promise<void> {
    if (!this.server) return;
    const sockets = [...this.server.sockets.sockets.values()].filter((s) => (s.data.user as SocketUser | undefined)?.id === userId && !(s.data.user as SocketUser).scope);
    if (sockets.length === 0) return;
    let fresh: AuthUser;
    try {
      fresh = await this.auth.loadActiveUser(userId);
    } catch (err) {
      for (const s of sockets) this.endSession(s, refusalMessage(err));
      return;
    }
    const may = (roles: readonly string[]) => roles.some((r) => fresh.roles.includes(r as AuthUser['roles'][number]));
    for (const s of sockets) {
      const inStation = [...s.rooms].some((r) => r.startsWith('station:'));
      const inBoard = s.rooms.has(BOARD_ROOM);
      if ((inStation && !may(SOCKET_POLICY.stationRoom)) || (inBoard && !may(SOCKET_POLICY.boardRoom))) {
        this.endSession(s, 'Your roles have changed and no longer allow this live view. Sign in again.');
      } else {
        s.data.user = { ...fresh, expiresAtMs: (s.data.user as SocketUser).expiresAtMs };
      }
    }
  }

  private armExpiry(socket: Socket): void {
    const user = socket.data.user as SocketUser | undefined;
    if (!user) return;
    const ms = user.expiresAtMs - Date.now();
    const timer = setTimeout(() => {
      if (Date.now() >= user.expiresAtMs) this.endSession(socket, 'Your session has expired. Sign in again.');
      else this.armExpiry(socket);
    }, Math.max(0, Math.min(ms, MAX_TIMER_MS)));
    timer.unref();
    this.expiryTimers.set(socket.id, timer);
  }

  /** Tells the client why (the UI signs in again on auth:error) and closes the socket. */
  private endSession(socket: Socket, message: string): void {
    const payload: AuthErrorPayload = { message };
    socket.emit('auth:error', payload);
    socket.disconnect(true);
  }
}
