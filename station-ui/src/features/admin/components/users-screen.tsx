import { Alert, Badge, Button, Group, Modal, Skeleton, Stack, Table, Text, VisuallyHidden } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { IconDeviceDesktop, IconKey, IconPencil, IconUserCheck, IconUserOff, IconUserPlus } from '@tabler/icons-react';
import { useState } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { roleLabels } from '@/config/roles';
import { useUser } from '@/lib/auth';
import { useUsers, type UserRow } from '../api/get-users';
import { useUpdateUser } from '../api/update-user';
import { describeAdminError } from './admin-error';
import { BoardLinkModal } from './board-link-modal';
import { CreateUserModal } from './create-user-modal';
import { EditUserModal } from './edit-user-modal';
import { ResetPasswordModal } from './reset-password-modal';
import classes from './users-screen.module.css';

/** Admin → Users: who may sign in, with which roles. */
export function UsersScreen() {
  const users = useUsers();
  const { data: me } = useUser();
  const update = useUpdateUser();
  const [creating, setCreating] = useState(false);
  const [boardLink, setBoardLink] = useState(false);
  const [editing, setEditing] = useState<UserRow | null>(null);
  const [resetting, setResetting] = useState<UserRow | null>(null);
  const [deactivating, setDeactivating] = useState<UserRow | null>(null);
  const [rowNotice, setRowNotice] = useState<string | null>(null);

  const setActive = (user: UserRow, active: boolean) => {
    setRowNotice(null);
    update.mutate(
      { id: user.id, active },
      {
        onSuccess: () => {
          setDeactivating(null);
          notifications.show({
            color: active ? 'signalGreen' : 'slate',
            title: active ? 'Reactivated' : 'Deactivated',
            message: active ? `${user.displayName} can sign in again.` : `${user.displayName} can no longer sign in. Their records stay.`,
          });
        },
        onError: (err) => {
          setDeactivating(null);
          setRowNotice(`${user.displayName}: ${describeAdminError(err, {}) ?? 'the change was refused.'}`);
        },
      },
    );
  };

  return (
    <>
      <PageHeader
        title="Users"
        description="Who may sign in to the stations, and what each person may open."
        actions={
          <Group gap="sm">
            <Button variant="default" leftSection={<IconDeviceDesktop size={18} aria-hidden />} onClick={() => setBoardLink(true)}>
              Board display link
            </Button>
            <Button leftSection={<IconUserPlus size={18} aria-hidden />} onClick={() => setCreating(true)}>
              Add user
            </Button>
          </Group>
        }
      />
      <BoardLinkModal opened={boardLink} onClose={() => setBoardLink(false)} />
      {rowNotice && (
        <Alert color="signalRed" variant="light" role="alert" mb="md" withCloseButton onClose={() => setRowNotice(null)}>
          {rowNotice}
        </Alert>
      )}
      {users.isPending ? (
        <Stack gap="xs" aria-busy="true" aria-label="Loading users">
          {[0, 1, 2, 3].map((i) => (
            <Skeleton key={i} height={44} />
          ))}
        </Stack>
      ) : users.isError ? (
        <ErrorNotice error={users.error} title="The user list could not be loaded" onRetry={() => users.refetch()} />
      ) : (
        <Table.ScrollContainer minWidth={760}>
          <Table verticalSpacing="sm" highlightOnHover className={classes.table} aria-label="Users">
            <Table.Thead>
              <Table.Tr>
                <Table.Th>Name</Table.Th>
                <Table.Th>User name</Table.Th>
                <Table.Th>Roles</Table.Th>
                <Table.Th>Status</Table.Th>
                <Table.Th>
                  <VisuallyHidden>Actions</VisuallyHidden>
                </Table.Th>
              </Table.Tr>
            </Table.Thead>
            <Table.Tbody>
              {users.data.map((u) => {
                const isMe = me?.id === u.id;
                return (
                  <Table.Tr key={u.id} data-inactive={!u.active || undefined} className={classes.row}>
                    <Table.Td>
                      <Text fw={700} span>
                        {u.displayName}
                      </Text>
                      {isMe && (
                        <Text span c="dimmed" size="sm" ml={6}>
                          (you)
                        </Text>
                      )}
                    </Table.Td>
                    <Table.Td className={classes.mono}>{u.username}</Table.Td>
                    <Table.Td>
                      <Group gap={4}>
                        {u.roles.length === 0 && (
                          <Text c="dimmed" size="sm">
                            none
                          </Text>
                        )}
                        {u.roles.map((r) => (
                          <Badge key={r} variant="light" color={r === 'admin' ? 'copper' : 'graphite'} radius="sm">
                            {roleLabels[r]}
                          </Badge>
                        ))}
                      </Group>
                    </Table.Td>
                    <Table.Td>
                      {u.active ? (
                        <Badge variant="dot" color="signalGreen" radius="sm">
                          Active
                        </Badge>
                      ) : (
                        <Badge variant="dot" color="slate" radius="sm">
                          Deactivated
                        </Badge>
                      )}
                    </Table.Td>
                    <Table.Td>
                      <Group gap={6} justify="flex-end" wrap="nowrap">
                        <Button
                          size="xs"
                          variant="default"
                          leftSection={<IconPencil size={14} aria-hidden />}
                          aria-label={`Edit ${u.displayName}`}
                          onClick={() => setEditing(u)}
                        >
                          Edit
                        </Button>
                        <Button
                          size="xs"
                          variant="default"
                          leftSection={<IconKey size={14} aria-hidden />}
                          aria-label={`New password for ${u.displayName}`}
                          onClick={() => setResetting(u)}
                        >
                          New password
                        </Button>
                        {u.active ? (
                          <Button
                            size="xs"
                            variant="subtle"
                            color="signalRed"
                            leftSection={<IconUserOff size={14} aria-hidden />}
                            aria-label={`Deactivate ${u.displayName}`}
                            disabled={isMe}
                            title={isMe ? 'You cannot deactivate the account you are signed in with.' : undefined}
                            onClick={() => setDeactivating(u)}
                          >
                            Deactivate
                          </Button>
                        ) : (
                          <Button
                            size="xs"
                            variant="subtle"
                            color="signalGreen"
                            leftSection={<IconUserCheck size={14} aria-hidden />}
                            aria-label={`Reactivate ${u.displayName}`}
                            loading={update.isPending && update.variables?.id === u.id}
                            onClick={() => setActive(u, true)}
                          >
                            Reactivate
                          </Button>
                        )}
                      </Group>
                    </Table.Td>
                  </Table.Tr>
                );
              })}
            </Table.Tbody>
          </Table>
        </Table.ScrollContainer>
      )}

      <CreateUserModal opened={creating} onClose={() => setCreating(false)} />
      <EditUserModal user={editing} onClose={() => setEditing(null)} />
      <ResetPasswordModal user={resetting} onClose={() => setResetting(null)} />
      <Modal opened={deactivating !== null} onClose={() => setDeactivating(null)} title="Deactivate this user?">
        {deactivating && (
          <Stack gap="md">
            <Text>
              <strong>{deactivating.displayName}</strong> will no longer be able to sign in. Their runs and audit entries stay
              as they are, and you can reactivate the account at any time.
            </Text>
            <Group justify="flex-end" gap="sm">
              <Button variant="default" onClick={() => setDeactivating(null)}>
                Keep active
              </Button>
              <Button color="signalRed" loading={update.isPending} onClick={() => setActive(deactivating, false)}>
                Deactivate
              </Button>
            </Group>
          </Stack>
        )}
      </Modal>
    </>
  );
}
