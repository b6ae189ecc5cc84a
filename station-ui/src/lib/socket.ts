import type { AuthErrorPayload, ClientMessageMap, JoinAck, StationEventMap } from '@station-events';
import { io, type Socket } from 'socket.io-client';

/** Server → client events, typed from the server's own event map (station-api/src/realtime/station-events.ts). */
export type ServerToClientEvents = { [K in keyof StationEventMap]: (payload: StationEventMap[K]) => void } & {
  'auth:error': (payload: AuthErrorPayload) => void;
};

/** Client → server messages; the server acknowledges each join or leave. */
export type ClientToServerEvents = {
  [K in keyof ClientMessageMap]: (body: ClientMessageMap[K], ack: (answer: JoinAck) => void) => void;
};

export type LiveSocket = Socket<ServerToClientEvents, ClientToServerEvents>;

/** How the live link stands, for the "Live link lost" banner. */
export type LiveLinkState = 'connecting' | 'live' | 'lost' | 'refused';

/**
 * Opens the live link to the station server on the page's own origin (the dev server proxies
 * `/socket.io`). The token goes in the handshake (`auth: {token}`), so a bad token is refused before
 * any event arrives. socket.io reconnects by itself; callers re-join their rooms on every `connect`.
 */
export function connectLive(token: string): LiveSocket {
  return io({
    auth: { token },
    // A wall board or a station screen runs all shift: keep trying, but do not hammer the server.
    reconnectionDelay: 500,
    reconnectionDelayMax: 5_000,
  });
}
