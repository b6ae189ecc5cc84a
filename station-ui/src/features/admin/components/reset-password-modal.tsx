import { Modal, PasswordInput, Stack, Text } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import type { UserRow } from '../api/get-users';
import { useResetPassword } from '../api/reset-password';
import { describeAdminError } from './admin-error';
import { ModalFooter } from './modal-footer';
import { checkPassword } from './user-rules';

interface ResetPasswordModalProps {
  user: UserRow | null;
  onClose: () => void;
}

export function ResetPasswordModal({ user, onClose }: ResetPasswordModalProps) {
  const reset = useResetPassword();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm({
    initialValues: { password: '', repeat: '' },
    validate: {
      password: checkPassword,
      repeat: (v, values) => (v === values.password ? null : 'The two passwords differ. Type the same one twice.'),
    },
  });

  const close = () => {
    form.reset();
    setNotice(null);
    reset.reset();
    onClose();
  };

  const submit = form.onSubmit(({ password }) => {
    if (!user) return;
    setNotice(null);
    reset.mutate(
      { id: user.id, password },
      {
        onSuccess: () => {
          notifications.show({ color: 'signalGreen', title: 'Password set', message: `${user.displayName} signs in with the new password from now on.` });
          close();
        },
        onError: (err) => setNotice(describeAdminError(err, { knownFields: ['password'], setFieldError: form.setFieldError })),
      },
    );
  });

  return (
    <Modal opened={user !== null} onClose={close} title={user ? `New password for ${user.displayName}` : 'New password'}>
      {user && (
        <form onSubmit={submit} noValidate>
          <Stack gap="md">
            <Text size="sm" c="dimmed">
              The old password stops working at once. Hand the new one over in person.
            </Text>
            <PasswordInput label="New password" autoComplete="new-password" withAsterisk {...form.getInputProps('password')} />
            <PasswordInput label="Repeat it" autoComplete="new-password" withAsterisk {...form.getInputProps('repeat')} />
            <ModalFooter notice={notice} onCancel={close} submitLabel="Set password" submitting={reset.isPending} />
          </Stack>
        </form>
      )}
    </Modal>
  );
}
