import { Modal, PasswordInput, Stack, TextInput } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import type { Role } from '@/config/roles';
import { useCreateUser } from '../api/create-user';
import { describeAdminError } from './admin-error';
import { ModalFooter } from './modal-footer';
import { RolePicker } from './role-picker';
import { checkDisplayName, checkPassword, checkRoles, checkUsername } from './user-rules';

interface CreateUserModalProps {
  opened: boolean;
  onClose: () => void;
}

interface Values {
  username: string;
  displayName: string;
  password: string;
  roles: Role[];
}

const fields = ['username', 'displayName', 'password', 'roles'] as const;

export function CreateUserModal({ opened, onClose }: CreateUserModalProps) {
  const create = useCreateUser();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm<Values>({
    initialValues: { username: '', displayName: '', password: '', roles: [] },
    validate: {
      username: checkUsername,
      displayName: checkDisplayName,
      password: checkPassword,
      roles: checkRoles,
    },
  });

  const close = () => {
    form.reset();
    setNotice(null);
    create.reset();
    onClose();
  };

  const submit = form.onSubmit((values) => {
    setNotice(null);
    const input = { ...values, username: values.username.trim(), displayName: values.displayName.trim() };
    create.mutate(input, {
      onSuccess: () => {
        notifications.show({ color: 'signalGreen', title: 'User added', message: `${input.displayName} can now sign in as ${input.username}.` });
        close();
      },
      onError: (err) =>
        setNotice(
          describeAdminError(err, { username: input.username, knownFields: fields, setFieldError: form.setFieldError }),
        ),
    });
  });

  return (
    <Modal opened={opened} onClose={close} title="Add a user" size="lg">
      <form onSubmit={submit} noValidate>
        <Stack gap="md">
          <TextInput label="Name" description="As colleagues know them, e.g. on run records" withAsterisk {...form.getInputProps('displayName')} />
          <TextInput
            label="User name"
            description="Used to sign in"
            withAsterisk
            autoCapitalize="none"
            spellCheck={false}
            {...form.getInputProps('username')}
          />
          <PasswordInput
            label="First password"
            description="Tell it to the person; they sign in with it"
            autoComplete="new-password"
            withAsterisk
            {...form.getInputProps('password')}
          />
          <RolePicker
            value={form.values.roles}
            onChange={(r) => form.setFieldValue('roles', r)}
            error={form.errors.roles}
          />
          <ModalFooter notice={notice} onCancel={close} submitLabel="Add user" submitting={create.isPending} />
        </Stack>
      </form>
    </Modal>
  );
}
