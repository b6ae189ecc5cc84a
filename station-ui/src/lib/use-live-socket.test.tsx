import { act, renderHook } from '@testing-library/react';
import { QueryClientProvider } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { FakeSocket, fireOn } from '@/testing/fake-socket';
import { createTestQueryClient } from '@/testing/render';
import { meQueryKey } from './auth';
import { useLiveSocket, type LiveRoom, type UseLiveSocketOptions } from './use-live-socket';

const sockets: FakeSocket<string>[] = [];
const tokens: string[] = [];
vi.mock('./socket', () => ({
  connectLive: (token: string) => {
    tokens.push(token);
    const s = new FakeSocket({ record: (event, body) => `${event} ${JSON.stringify(body)}`, ackRoom: () => 'room' });
    sockets.push(s);
    return s;
  },
}));

const last = () => sockets[sockets.length - 1]!;
const rooms: LiveRoom[] = [{ event: 'station:join', body: { stationId: 3 } }];

function setup(options: Partial<UseLiveSocketOptions> = {}) {
  const queryClient = createTestQueryClient();
  queryClient.setQueryData(meQueryKey, { id: 1 });
  const wrapper = ({ children }: { children: ReactNode }) => <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
  const hook = renderHook((props: Partial<UseLiveSocketOptions>) => useLiveSocket({ token: 'jwt-1', rooms, ...options, ...props }), { wrapper });
  return { ...hook, queryClient };
}

describe('useLiveSocket', () => {
  beforeEach(() => {
    sockets.length = 0;
    tokens.length = 0;
  });

  it('connects with the token, joins the rooms and reports online', async () => {
    const onJoined = vi.fn();
    const { result } = setup({ onJoined });
    expect(tokens).toEqual(['jwt-1']);
    expect(result.current.status).toBe('connecting');
    await fireOn(last(), 'connect', undefined);
    expect(last().sent).toEqual(['station:join {"stationId":3}']);
    expect(result.current.status).toBe('online');
    expect(onJoined).toHaveBeenCalledWith({ rejoin: false });
  });

  it('goes offline when the link drops and rejoins the rooms on reconnect', async () => {
    const onJoined = vi.fn();
    const { result } = setup({ onJoined });
    await fireOn(last(), 'connect', undefined);
    await fireOn(last(), 'disconnect', 'transport close');
    expect(result.current.status).toBe('offline');
    await fireOn(last(), 'connect', undefined);
    expect(last().sent).toHaveLength(2);
    expect(result.current.status).toBe('online');
    expect(onJoined).toHaveBeenLastCalledWith({ rejoin: true });
  });

  it('passes server events to the latest handlers without reconnecting', async () => {
    const first = vi.fn();
    const second = vi.fn();
    const { rerender } = setup({ on: { 'station:state': first } });
    rerender({ on: { 'station:state': second } });
    await fireOn(last(), 'station:state', { stationId: 3, state: 'ready', reasons: [], emittedAt: 1 });
    expect(first).not.toHaveBeenCalled();
    expect(second).toHaveBeenCalledTimes(1);
    expect(sockets).toHaveLength(1);
  });

  it('on auth:error asks who is signed in again by default, which leads to the sign-in page', async () => {
    const { result, queryClient } = setup();
    await fireOn(last(), 'connect', undefined);
    await fireOn(last(), 'auth:error', { message: 'Your session has ended.' });
    expect(result.current).toMatchObject({ status: 'offline', refused: true, message: 'Your session has ended.' });
    expect(queryClient.getQueryState(meQueryKey)?.isInvalidated).toBe(true);
  });

  it('hands a refused token to its own handler (the wall board) instead', async () => {
    const onAuthError = vi.fn();
    const { queryClient } = setup({ onAuthError });
    const err = Object.assign(new Error('jwt expired'), { data: { code: 'unauthorized', message: 'jwt expired' } });
    await fireOn(last(), 'connect_error', err);
    expect(onAuthError).toHaveBeenCalledWith('jwt expired');
    expect(queryClient.getQueryState(meQueryKey)?.isInvalidated).toBe(false);
  });

  it('opens no link without a token', () => {
    const { result } = setup({ token: null });
    expect(sockets).toHaveLength(0);
    expect(result.current.status).toBe('offline');
  });

  it('reconnects with a new token', async () => {
    const { rerender } = setup();
    await act(async () => rerender({ token: 'jwt-2' }));
    expect(tokens).toEqual(['jwt-1', 'jwt-2']);
  });
});
