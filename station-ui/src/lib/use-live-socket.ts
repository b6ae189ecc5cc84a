import { useQueryClient } from '@tanstack/react-query';
import type { ClientMessageMap, JoinAck } from '@station-events';
import { useEffect, useRef, useState } from 'react';
import { meQueryKey } from './auth';
import { connectLive, type LiveLinkState, type LiveSocket, type ServerToClientEvents } from './socket';

/** How the live link stands, for a chip or banner: never "online" while the server cannot be reached. */
export type LiveStatus = 'online' | 'connecting' | 'offline';

/** A room to join on every (re)connect: `station:join` with its station, or `board:join`. */
export type LiveRoom = { [K in keyof ClientMessageMap]: { event: K; body: ClientMessageMap[K] } }[keyof ClientMessageMap];

/** Server events to listen to; the latest handlers are used without reconnecting. */
export type LiveHandlers = Partial<ServerToClientEvents>;

export interface UseLiveSocketOptions {
  /** Bearer token for the handshake; null: no link is opened (status `offline`). */
  token: string | null;
  /** Rooms joined on connect and re-joined after every reconnect. */
  rooms: readonly LiveRoom[];
  /** Server events → handlers. */
  on?: LiveHandlers;
  /**
   * After all rooms are joined. `rejoin` is true after a reconnect: events sent while the link was down are
   * lost, so refetch what the screen shows.
   */
  onJoined?: (info: { rejoin: boolean }) => void;
  /**
   * The server refused the token (`connect_error` unauthorized, or `auth:error` before it drops the link).
   * Default: ask who is signed in again; that answers 401 and the app sends the person to sign in.
   * A wall board passes its own (it must never land on the sign-in page).
   */
  onAuthError?: (message: string) => void;
}

export interface LiveSocketState {
  status: LiveStatus;
  /** The server refused the token or a room; no more reconnecting until the token changes. */
  refused: boolean;
  /** The server's words when it refused. */
  message: string | null;
}

const UNAUTHORIZED = 'unauthorized';

/**
 * The one socket lifecycle for every live screen: connects with the JWT, joins the rooms, re-joins them after
 * each reconnect (socket.io reconnects by itself), handles a refused token, and reports the connection status.
 */
export function useLiveSocket(options: UseLiveSocketOptions): LiveSocketState {
  const queryClient = useQueryClient();
  const { token, rooms } = options;
  const [state, setState] = useState<LiveSocketState>({ status: token ? 'connecting' : 'offline', refused: false, message: null });
  const latest = useRef(options);
  latest.current = options;
  // rooms compared by value, so a new array literal each render does not reconnect
  const roomsKey = JSON.stringify(rooms);

  useEffect(() => {
    if (!token) {
      setState({ status: 'offline', refused: false, message: null });
      return;
    }
    const joinRooms: LiveRoom[] = JSON.parse(roomsKey);
    setState({ status: 'connecting', refused: false, message: null });
    const socket: LiveSocket = connectLive(token);
    let joinedBefore = false;
    let refused = false;

    const refuse = (message: string, authError: boolean) => {
      if (refused) return;
      refused = true;
      setState({ status: 'offline', refused: true, message });
      socket.disconnect();
      if (!authError) return;
      const handler = latest.current.onAuthError;
      if (handler) handler(message);
      else void queryClient.invalidateQueries({ queryKey: meQueryKey });
    };

    socket.on('connect', () => {
      let pending = joinRooms.length;
      const joined = () => {
        setState({ status: 'online', refused: false, message: null });
        latest.current.onJoined?.({ rejoin: joinedBefore });
        joinedBefore = true;
      };
      if (pending === 0) joined();
      for (const room of joinRooms) {
        const ack = (answer: JoinAck | undefined): void => {
          if (!answer?.ok) return refuse(answer?.message ?? 'The station server refused to send these events.', false);
          pending -= 1;
          if (pending === 0) joined();
        };
        // the union of rooms needs one cast: socket.io's typed emit cannot narrow a union event name
        (socket.emit as (event: string, body: unknown, ack: (answer: JoinAck | undefined) => void) => void)(room.event, room.body, ack);
      }
    });
    socket.on('disconnect', (reason) => {
      if (!refused && reason !== 'io client disconnect') setState({ status: 'offline', refused: false, message: null });
    });
    socket.on('connect_error', (err) => {
      const data = (err as Error & { data?: { code?: string; message?: string } }).data;
      if (data?.code === UNAUTHORIZED) refuse(data.message ?? err.message, true);
      else if (!refused) setState({ status: 'offline', refused: false, message: null });
    });
    socket.on('auth:error', (p) => refuse(p?.message ?? 'The session has ended.', true));

    // every server event goes through the latest handlers
    const events = Object.keys(latest.current.on ?? {}) as (keyof ServerToClientEvents)[];
    for (const event of events) {
      if (event === 'auth:error') continue;
      (socket.on as (e: string, fn: (p: unknown) => void) => void)(event, (payload) => {
        const fn = latest.current.on?.[event] as ((p: unknown) => void) | undefined;
        fn?.(payload);
      });
    }

    return () => {
      socket.removeAllListeners();
      socket.disconnect();
    };
  }, [token, roomsKey, queryClient]);

  return state;
}

/** The older four-word link state (the station's banner reads it) from the hook's state. */
export function linkStateOf(state: LiveSocketState): LiveLinkState {
  if (state.refused) return 'refused';
  if (state.status === 'online') return 'live';
  return state.status === 'connecting' ? 'connecting' : 'lost';
}
