import { screen, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { UsersScreen } from './users-screen';

const rows = [
  { id: 4, username: 'admin', displayName: 'Administrator', roles: ['admin'], active: true },
  { id: 7, username: 'k.ahn', displayName: 'K. Ahn', roles: ['operator', 'quality'], active: false },
];

describe('UsersScreen', () => {
  it('lists users with roles as badges, marks the signed-in admin and who is deactivated', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(200, rows)));
    renderApp(<UsersScreen />, { signedInAs: makeUser(['admin'], { id: 4, username: 'admin' }) });

    const table = await screen.findByRole('table', { name: 'Users' });
    const [, adminRow, ahnRow] = within(table).getAllByRole('row');
    expect(within(adminRow).getByText('(you)')).toBeInTheDocument();
    expect(within(adminRow).getByRole('button', { name: 'Deactivate Administrator' })).toBeDisabled();
    expect(within(ahnRow).getByText('Operator')).toBeInTheDocument();
    expect(within(ahnRow).getByText('Quality')).toBeInTheDocument();
    expect(within(ahnRow).getByText('Deactivated')).toBeInTheDocument();
    expect(within(ahnRow).getByRole('button', { name: 'Reactivate K. Ahn' })).toBeEnabled();
  });

  it('shows the not-allowed page when the server answers 403', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => jsonResponse(403, { statusCode: 403, error: 'Forbidden', message: 'This needs the role: admin.' })),
    );
    renderApp(<UsersScreen />, { route: '/admin/users', signedInAs: makeUser(['admin']) });
    expect(await screen.findByRole('heading', { name: 'Not allowed for your role' })).toBeInTheDocument();
    expect(screen.getByText(/This needs the role: admin\./)).toBeInTheDocument();
  });

  it('says so when the server cannot be reached, with a way to retry', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))));
    renderApp(<UsersScreen />, { signedInAs: makeUser(['admin']) });
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('The user list could not be loaded');
    expect(alert).toHaveTextContent('The station server cannot be reached.');
    expect(within(alert).getByRole('button', { name: 'Try again' })).toBeInTheDocument();
  });
});
