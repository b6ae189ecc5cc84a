import { Modal, Stack, Text, TextInput } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useEffect, useState } from 'react';
import type { Role } from '@/config/roles';
import type { UserRow } from '../api/get-users';
import { useUpdateUser } from '../api/update-user';
import { describeAdminError } from './admin-error';
import { ModalFooter } from './modal-footer';
import { RolePicker } from './role-picker';
import { checkDisplayName, checkRoles } from './user-rules';

interface EditUserModalProps {
  user: UserRow | null;
  onClose: () => void;
}

interface Values {
  displayName: string;
  roles: Role[];
}

const fields = ['displayName', 'roles'] as const;

/** Change a user's name and roles. The user name is fixed: it is on every record they signed. */
export function EditUserModal({ user, onClose }: EditUserModalProps) {
  const update = useUpdateUser();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm<Values>({
    initialValues: { displayName: '', roles: [] },
    validate: { displayName: checkDisplayName, roles: checkRoles },
  });

  const { setValues, resetDirty } = form;
  useEffect(() => {
    if (user) {
      setValues({ displayName: user.displayName, roles: [...user.roles] });
      resetDirty({ displayName: user.displayName, roles: [...user.roles] });
    }
    // Refill only when another user is opened, not when the list refetches behind the open modal.
  }, [user?.id]);

  const close = () => {
    setNotice(null);
    update.reset();
    onClose();
  };

  const submit = form.onSubmit((values) => {
    if (!user) return;
    setNotice(null);
    const changes: { displayName?: string; roles?: Role[] } = {};
    if (values.displayName.trim() !== user.displayName) changes.displayName = values.displayName.trim();
    if (values.roles.join() !== user.roles.join()) changes.roles = values.roles;
    if (Object.keys(changes).length === 0) {
      close();
      return;
    }
    update.mutate(
      { id: user.id, ...changes },
      {
        onSuccess: () => {
          notifications.show({ color: 'signalGreen', title: 'Saved', message: `${values.displayName.trim()} updated.` });
          close();
        },
        onError: (err) => setNotice(describeAdminError(err, { knownFields: fields, setFieldError: form.setFieldError })),
      },
    );
  });

  return (
    <Modal opened={user !== null} onClose={close} title={user ? `Edit ${user.displayName}` : 'Edit user'} size="lg">
      {user && (
        <form onSubmit={submit} noValidate>
          <Stack gap="md">
            <Text size="sm" c="dimmed">
              User name <Text span ff="monospace">{user.username}</Text> stays as it is.
            </Text>
            <TextInput label="Name" withAsterisk {...form.getInputProps('displayName')} />
            <RolePicker value={form.values.roles} onChange={(r) => form.setFieldValue('roles', r)} error={form.errors.roles} />
            <ModalFooter notice={notice} onCancel={close} submitLabel="Save changes" submitting={update.isPending} />
          </Stack>
        </form>
      )}
    </Modal>
  );
}
