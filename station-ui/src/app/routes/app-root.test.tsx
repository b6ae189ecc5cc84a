import { screen } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { BOARD_DISPLAY_TOKEN_KEY } from '@/features/board/board-display';
import { sampleBoard } from '@/features/board/test-data';
import { FakeSocket } from '@/testing/fake-socket';
import { jsonResponse, renderApp } from '@/testing/render';
import { AppRoot } from './app-root';

vi.mock('@/lib/socket', () => ({
  connectLive: () => new FakeSocket({ record: (event) => event, ackRoom: () => 'board' }),
}));

function renderAt(route: string) {
  return renderApp(
    <Routes>
      <Route path="/" element={<AppRoot />}>
        <Route path="board" element={<div>board inside the app</div>} />
      </Route>
      <Route path="/sign-in" element={<div>sign-in page</div>} />
    </Routes>,
    { route },
  );
}

afterEach(() => {
  vi.unstubAllGlobals();
  window.localStorage.removeItem(BOARD_DISPLAY_TOKEN_KEY);
});

describe('AppRoot on a wall screen (/board?display=<token>)', () => {
  it('shows the board with the display token, without the app frame and without asking anyone to sign in', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(200, sampleBoard())));
    renderAt('/board?display=board-only-token');
    expect(await screen.findByTestId('tile-EOL-1')).toBeInTheDocument();
    expect(screen.queryByText('sign-in page')).toBeNull();
    expect(window.localStorage.getItem(BOARD_DISPLAY_TOKEN_KEY)).toBe('board-only-token');
  });

  it('sends a person without a token or display link to sign in, as before', async () => {
    renderAt('/board');
    expect(await screen.findByText('sign-in page')).toBeInTheDocument();
  });
});
