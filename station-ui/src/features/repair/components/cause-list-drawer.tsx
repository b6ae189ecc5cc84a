import { ActionIcon, Alert, Badge, Button, Drawer, Group, Stack, Table, Text, TextInput, VisuallyHidden } from '@mantine/core';
import { IconCheck, IconPencil, IconTrash, IconX } from '@tabler/icons-react';
import { useState } from 'react';
import { isApiError } from '@/lib/api-client';
import { useChangeRepairCause, useRepairCauses, type CauseChange } from '../api/repair-causes';
import type { RepairCause } from '../api/repair-types';

/** The list of repair causes for engineers: add, rename, switch off or on, delete one never used (all audited). */
export function CauseListDrawer({ opened, onClose }: { opened: boolean; onClose: () => void }) {
  const causes = useRepairCauses(true);
  const change = useChangeRepairCause();
  const [name, setName] = useState('');
  const [notice, setNotice] = useState<string | null>(null);
  const run = (c: CauseChange, then?: () => void) => {
    setNotice(null);
    change.mutate(c, { onSuccess: then, onError: (e) => setNotice(isApiError(e) ? e.message : 'The change could not be saved. Try again.') });
  };
  return (
    <Drawer opened={opened} onClose={onClose} title="Repair causes" position="right" size="lg">
      <Stack gap="md">
        <Text size="sm" c="dimmed">
          The causes offered in the repair form. A cause that repair records name cannot be deleted: switch it off, and the records keep it.
        </Text>
        <form
          onSubmit={(e) => {
            e.preventDefault();
            if (name.trim().length < 3) return setNotice('A cause name has at least 3 characters.');
            run({ kind: 'add', name: name.trim() }, () => setName(''));
          }}
        >
          <Group align="flex-end" gap="sm">
            <TextInput label="New cause" placeholder="e.g. Tombstoned resistor" maxLength={80} value={name} onChange={(e) => setName(e.currentTarget.value)} style={{ flex: 1 }} />
            <Button type="submit" loading={change.isPending && change.variables?.kind === 'add'}>
              Add
            </Button>
          </Group>
        </form>
        {notice && (
          <Alert color="signalRed" variant="light" role="alert">
            {notice}
          </Alert>
        )}
        <Table aria-label="Repair causes" striped>
          <Table.Thead>
            <Table.Tr>
              <Table.Th>Cause</Table.Th>
              <Table.Th ta="right">Records</Table.Th>
              <Table.Th>
                <VisuallyHidden>Changes</VisuallyHidden>
              </Table.Th>
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {(causes.data ?? []).map((c) => (
              <CauseRow key={c.id} cause={c} onChange={run} />
            ))}
          </Table.Tbody>
        </Table>
      </Stack>
    </Drawer>
  );
}

function CauseRow({ cause, onChange }: { cause: RepairCause; onChange: (c: CauseChange, then?: () => void) => void }) {
  const [editing, setEditing] = useState(false);
  const [name, setName] = useState(cause.name);
  return (
    <Table.Tr>
      <Table.Td>
        {editing ? (
          <Group gap={4} wrap="nowrap">
            <TextInput size="xs" aria-label={`New name for ${cause.name}`} value={name} maxLength={80} onChange={(e) => setName(e.currentTarget.value)} />
            <ActionIcon variant="light" aria-label="Save the name" onClick={() => onChange({ kind: 'rename', id: cause.id, name: name.trim() }, () => setEditing(false))}>
              <IconCheck size={16} />
            </ActionIcon>
            <ActionIcon variant="subtle" aria-label="Keep the old name" onClick={() => (setName(cause.name), setEditing(false))}>
              <IconX size={16} />
            </ActionIcon>
          </Group>
        ) : (
          <Group gap={6}>
            <Text size="sm" c={cause.active ? undefined : 'dimmed'}>
              {cause.name}
            </Text>
            {!cause.active && (
              <Badge size="sm" variant="outline" color="gray">
                Switched off
              </Badge>
            )}
          </Group>
        )}
      </Table.Td>
      <Table.Td ff="monospace" ta="right">
        {cause.recordCount}
      </Table.Td>
      <Table.Td>
        <Group gap={4} justify="flex-end" wrap="nowrap">
          <ActionIcon variant="subtle" aria-label={`Rename ${cause.name}`} onClick={() => setEditing(true)}>
            <IconPencil size={16} />
          </ActionIcon>
          <Button size="compact-xs" variant="light" onClick={() => onChange({ kind: 'switch', id: cause.id, active: !cause.active })}>
            {cause.active ? 'Switch off' : 'Switch on'}
          </Button>
          {cause.recordCount === 0 && (
            <ActionIcon variant="subtle" color="signalRed" aria-label={`Delete ${cause.name}`} onClick={() => onChange({ kind: 'delete', id: cause.id })}>
              <IconTrash size={16} />
            </ActionIcon>
          )}
        </Group>
      </Table.Td>
    </Table.Tr>
  );
}
