import { screen } from '@testing-library/react';
import { Route, Routes, useLocation } from 'react-router-dom';
import { describe, expect, it, vi } from 'vitest';
import { AppRoot } from '@/app/routes/app-root';
import { ErrorNotice } from '@/components/errors/error-notice';
import { ApiError, setUnauthorizedHandler } from '@/lib/api-client';
import { sessionNotice } from '@/lib/auth';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { NotAllowed } from './not-allowed';

function shell() {
  return (
    <Routes>
      <Route element={<AppRoot />}>
        <Route path="/admin/users" element={<p>user list</p>} />
        <Route path="/plans" element={<p>plan list</p>} />
        <Route path="/station" element={<p>station screen</p>} />
      </Route>
    </Routes>
  );
}

describe('not allowed', () => {
  it('names the roles that may open the page and the roles the person has', () => {
    renderApp(<NotAllowed />, { route: '/admin/users', signedInAs: makeUser(['operator']) });
    expect(screen.getByRole('heading', { name: 'Not allowed for your role' })).toBeInTheDocument();
    expect(screen.getByTestId('allowed-roles')).toHaveTextContent(/^Admin$/);
    expect(screen.getByText(/You are signed in as Operator/)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to my start page' })).toHaveAttribute('href', '/station');
  });

  it('is what the shell shows instead of a page outside the roles', () => {
    renderApp(shell(), { route: '/plans', signedInAs: makeUser(['operator']) });
    expect(screen.getByRole('heading', { name: 'Not allowed for your role' })).toBeInTheDocument();
    expect(screen.getByTestId('allowed-roles')).toHaveTextContent('Engineer or Admin');
    expect(screen.queryByText('plan list')).not.toBeInTheDocument();
  });

  it('lets the page through when one of the roles fits', () => {
    renderApp(shell(), { route: '/plans', signedInAs: makeUser(['quality', 'engineer']) });
    expect(screen.getByText('plan list')).toBeInTheDocument();
    expect(screen.queryByRole('heading', { name: 'Not allowed for your role' })).not.toBeInTheDocument();
  });

  it('is also what a 403 from the server turns into', () => {
    const refused = new ApiError(403, 'Forbidden', 'This route needs one of the roles: admin');
    renderApp(<ErrorNotice error={refused} title="x" />, { route: '/admin/users', signedInAs: makeUser(['quality']) });
    expect(screen.getByRole('heading', { name: 'Not allowed for your role' })).toBeInTheDocument();
    expect(screen.getByText(/This route needs one of the roles: admin/)).toBeInTheDocument();
  });

  it('sends someone who is not signed in to sign in, keeping the address', () => {
    vi.stubGlobal('fetch', vi.fn());
    renderApp(
      <Routes>
        <Route path="/sign-in" element={<SignInProbe />} />
        <Route element={<AppRoot />}>
          <Route path="/plans" element={<p>plan list</p>} />
        </Route>
      </Routes>,
      { route: '/plans?product=OB-BK0503' },
    );
    expect(screen.getByTestId('probe')).toHaveTextContent('/sign-in?next=%2Fplans%3Fproduct%3DOB-BK0503');
  });
});

describe('a session that ends', () => {
  it('sends people to sign in with the server reason when their account was deactivated', async () => {
    const message = 'This account has been deactivated or removed since you signed in. Ask an administrator.';
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => jsonResponse(401, { statusCode: 401, error: 'Unauthorized', message, details: { code: 'account_deactivated' } })),
    );
    setUnauthorizedHandler(() => {});
    renderApp(
      <Routes>
        <Route path="/sign-in" element={<SignInProbe />} />
        <Route element={<AppRoot />}>
          <Route path="/lots" element={<p>lot list</p>} />
        </Route>
      </Routes>,
      { route: '/lots', storedToken: 'stale' },
    );
    expect(await screen.findByTestId('probe')).toHaveTextContent('/sign-in?next=%2Flots');
    expect(sessionNotice.get()).toBe(message);
    expect(window.localStorage.getItem('railwright.token')).toBeNull();
    sessionNotice.clear();
  });
});

function SignInProbe() {
  const location = useLocation();
  return <p data-testid="probe">{location.pathname + location.search}</p>;
}
