import { Logger } from '@nestjs/common';
import {
  ConnectedSocket,
  MessageBody,
  OnGatewayConnection,
  OnGatewayInit,
  SubscribeMessage,
  WebSocketGateway,
} from '@nestjs/websockets';
import type { Server, Socket } from 'socket.io';
import { AuthService } from '../auth/auth.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { AuthErrorPayload, BOARD_ROOM, JoinAck, stationRoom } from './station-events';
import { StationEventsPublisher } from './station-events.publisher';

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
  if (typeof id === 'number' && Number.isInteger(id) && id > 0) return id;
  return `stationId must be a positive whole number, got ${JSON.stringify(id ?? null)}`;
}

/**
 * Live station events over socket.io, on the HTTP server's port. Every connection is signed in: the
 * access token is checked during the handshake (refused with a readable `connect_error`) and again in
 * `handleConnection` in case a socket slipped past the middleware.
 */
@WebSocketGateway({ cors: true })
export class StationEventsGateway implements OnGatewayInit, OnGatewayConnection {
  private readonly logger = new Logger(StationEventsGateway.name);

  constructor(
    private readonly auth: AuthService,
    private readonly publisher: StationEventsPublisher,
  ) {}

  afterInit(server: Server): void {
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
    if (socket.data.user) return;
    try {
      socket.data.user = await this.auth.verifyAccessToken(tokenOf(socket));
    } catch (err) {
      const payload: AuthErrorPayload = { message: refusalMessage(err) };
      socket.emit('auth:error', payload);
      socket.disconnect(true);
    }
  }

  @SubscribeMessage('station:join')
  async joinStation(@ConnectedSocket() socket: Socket, @MessageBody() body: unknown): Promise<JoinAck> {
    const id = stationIdOf(body);
    if (typeof id === 'string') return { ok: false, message: id };
    const room = stationRoom(id);
    await socket.join(room);
    // replay the station's current state so the screen can render at once
    const last = this.publisher.lastStateOf(id);
    if (last) socket.emit('station:state', last);
    this.logger.debug(`${(socket.data.user as AuthUser).username} joined ${room}`);
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
    await socket.join(BOARD_ROOM);
    for (const state of this.publisher.allLastStates()) socket.emit('station:state', state);
    return { ok: true, room: BOARD_ROOM };
  }
}
