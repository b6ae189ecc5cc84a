import { screen } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { BoardLinkModal } from './board-link-modal';

afterEach(() => vi.unstubAllGlobals());

describe('BoardLinkModal', () => {
  it('issues a board-only token for a named screen and shows the address to copy', async () => {
    const fetchMock = vi.fn(async () => jsonResponse(201, { token: 'tok.en', expiresAt: '2027-01-01T06:00:00.000Z' }));
    vi.stubGlobal('fetch', fetchMock);
    const { user } = renderApp(<BoardLinkModal opened onClose={() => undefined} />, { signedInAs: makeUser(['admin']) });
    await user.click(screen.getByRole('button', { name: 'Make link' }));
    expect(screen.getByText(/Name the screen the link is for/)).toBeInTheDocument();
    expect(fetchMock).not.toHaveBeenCalled();

    await user.type(screen.getByLabelText('Which screen is it for?'), 'Hall B, above line 2');
    await user.click(screen.getByRole('button', { name: 'Make link' }));
    const address = await screen.findByLabelText('Board address');
    expect(address).toHaveValue(`${window.location.origin}/board?display=tok.en`);
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/auth/board-token');
    expect(JSON.parse(String(init.body))).toEqual({ label: 'Hall B, above line 2' });
    expect(screen.getByRole('button', { name: 'Copy address' })).toBeInTheDocument();
  });
});
