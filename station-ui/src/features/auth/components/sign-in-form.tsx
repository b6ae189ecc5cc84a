import { Alert, Button, PasswordInput, Stack, TextInput } from '@mantine/core';
import { useForm } from '@mantine/form';
import { IconAlertCircle } from '@tabler/icons-react';
import { useRef } from 'react';
import { isApiError } from '@/lib/api-client';
import type { AuthUser } from '@/lib/auth';
import { useSignIn } from '../api/sign-in';

interface SignInFormProps {
  onSignedIn: (user: AuthUser) => void;
}

/**
 * Words for a refused sign-in. A plain mismatch gets our sentence; anything the person can act on
 * differently (deactivated account, 429 too many attempts) is shown as the server words it.
 */
export function signInErrorText(error: unknown): string {
  if (isApiError(error)) {
    if (error.status === 401 && (error.code === undefined || error.code === 'bad_credentials')) {
      return 'That user name and password do not match. Check both and try again.';
    }
    return error.message;
  }
  return 'Signing in did not work. Try again.';
}

/** User name + password. Large fields: operators sign in standing, sometimes with gloves on. */
export function SignInForm({ onSignedIn }: SignInFormProps) {
  const signIn = useSignIn();
  const passwordRef = useRef<HTMLInputElement>(null);
  const form = useForm({
    mode: 'uncontrolled',
    initialValues: { username: '', password: '' },
    validate: {
      username: (v) => (v.trim() ? null : 'Enter your user name.'),
      password: (v) => (v ? null : 'Enter your password.'),
    },
  });

  const submit = form.onSubmit((values) => {
    signIn.mutate(
      { username: values.username.trim(), password: values.password },
      {
        onSuccess: (result) => onSignedIn(result.user),
        onError: (err) => {
          if (isApiError(err) && err.status === 401 && err.code !== 'account_deactivated') {
            // Keep the user name, retype the password: the usual slip is in the password.
            form.setFieldValue('password', '');
            passwordRef.current?.focus();
          }
        },
      },
    );
  });

  return (
    <form onSubmit={submit} noValidate aria-label="Sign in">
      <Stack gap="md">
        <TextInput
          label="User name"
          size="lg"
          autoComplete="username"
          autoCapitalize="none"
          spellCheck={false}
          data-autofocus
          autoFocus
          key={form.key('username')}
          {...form.getInputProps('username')}
        />
        <PasswordInput
          label="Password"
          size="lg"
          autoComplete="current-password"
          ref={passwordRef}
          key={form.key('password')}
          {...form.getInputProps('password')}
        />
        {signIn.isError && (
          <Alert color="signalRed" variant="light" icon={<IconAlertCircle aria-hidden />} role="alert" data-testid="sign-in-error">
            {signInErrorText(signIn.error)}
          </Alert>
        )}
        <Button type="submit" size="lg" fullWidth loading={signIn.isPending} disabled={signIn.isPending}>
          Sign in
        </Button>
      </Stack>
    </form>
  );
}
