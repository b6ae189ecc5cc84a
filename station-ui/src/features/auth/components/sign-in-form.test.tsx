import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { jsonResponse, makeUser, renderApp } from '@/testing/render';
import { SignInForm } from './sign-in-form';

async function fillAndSubmit(user: ReturnType<typeof renderApp>['user'], name: string, password: string) {
  await user.type(screen.getByLabelText('User name'), name);
  await user.type(screen.getByLabelText('Password'), password);
  await user.click(screen.getByRole('button', { name: 'Sign in' }));
}

describe('SignInForm', () => {
  it('says plainly that name and password do not match on a 401, and clears the password', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => jsonResponse(401, { statusCode: 401, error: 'Unauthorized', message: 'Invalid credentials' })),
    );
    const onSignedIn = vi.fn();
    const { user } = renderApp(<SignInForm onSignedIn={onSignedIn} />);
    await fillAndSubmit(user, 'operator', 'wrong-password');

    expect(await screen.findByRole('alert')).toHaveTextContent('That user name and password do not match.');
    expect(screen.getByLabelText('Password')).toHaveValue('');
    expect(screen.getByLabelText('User name')).toHaveValue('operator');
    expect(onSignedIn).not.toHaveBeenCalled();
  });

  it('shows the server message for 429 as given', async () => {
    const message = 'Too many sign-in attempts from this screen. Wait a minute, then try again.';
    vi.stubGlobal('fetch', vi.fn(async () => jsonResponse(429, { statusCode: 429, error: 'Too Many Requests', message })));
    const { user } = renderApp(<SignInForm onSignedIn={() => {}} />);
    await fillAndSubmit(user, 'operator', 'x');
    expect(await screen.findByRole('alert')).toHaveTextContent(message);
  });

  it('says the server cannot be reached when the request fails outright', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))));
    const { user } = renderApp(<SignInForm onSignedIn={() => {}} />);
    await fillAndSubmit(user, 'operator', 'x');
    expect(await screen.findByRole('alert')).toHaveTextContent('The station server cannot be reached.');
  });

  it('asks for both fields before sending anything', async () => {
    const fetchMock = vi.fn();
    vi.stubGlobal('fetch', fetchMock);
    const { user } = renderApp(<SignInForm onSignedIn={() => {}} />);
    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter your user name.')).toBeInTheDocument();
    expect(screen.getByText('Enter your password.')).toBeInTheDocument();
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('disables the button while signing in, then reports the user', async () => {
    let answer: (r: Response) => void = () => {};
    const fetchMock = vi.fn(() => new Promise<Response>((resolve) => (answer = resolve)));
    vi.stubGlobal('fetch', fetchMock);
    const onSignedIn = vi.fn();
    const { user } = renderApp(<SignInForm onSignedIn={onSignedIn} />);
    await fillAndSubmit(user, ' engineer ', 'engineer-demo');

    await waitFor(() => expect(screen.getByRole('button', { name: /sign in/i })).toBeDisabled());
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/auth/login');
    expect(JSON.parse(String(init.body))).toEqual({ username: 'engineer', password: 'engineer-demo' });

    const engineer = makeUser(['engineer']);
    answer(jsonResponse(200, { accessToken: 'tok', expiresIn: 43200, user: engineer }));
    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(engineer));
    expect(window.localStorage.getItem('railwright.token')).toBe('tok');
  });
});

describe('signInErrorText', () => {
  it('passes on the server sentence for a deactivated account, which a mismatch message would hide', async () => {
    const { ApiError } = await import('@/lib/api-client');
    const deactivated = new ApiError(401, 'Unauthorized', 'This account is deactivated. Ask an administrator to reactivate it.', {
      code: 'account_deactivated',
    });
    const mismatch = new ApiError(401, 'Unauthorized', 'Wrong username or password.', { code: 'bad_credentials' });
    const { signInErrorText } = await import('./sign-in-form');
    expect(signInErrorText(deactivated)).toBe('This account is deactivated. Ask an administrator to reactivate it.');
    expect(signInErrorText(mismatch)).toBe('That user name and password do not match. Check both and try again.');
  });
});
