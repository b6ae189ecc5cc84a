import { Alert, Button, Checkbox, Group, Modal, Stack, Text, Textarea } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import { useRepairUnit, type RepairAction } from '../api/repair-unit';
import { ACTION_WORDS, checkNote, describeRepairError, NOTE_MAX } from '../repair-words';

export interface RepairTarget {
  serial: string;
  action: RepairAction;
}

interface RepairModalProps {
  /** The unit and the step asked for; null keeps the dialog closed */
  target: RepairTarget | null;
  onClose: () => void;
}

const EXPLAIN: Record<RepairAction, string> = {
  receive: 'The unit is on the repair bench from now on. The stations refuse it until you return it for retest.',
  return: 'The unit goes back to the line as untested and gets a fresh set of test attempts. Its earlier runs stay as they are.',
  scrap: 'The unit leaves production for good. No station will test it again, and this cannot be undone.',
};

/** One repair step on one unit: a note is required (it is the repair record); scrapping asks for an explicit yes. */
export function RepairModal({ target, onClose }: RepairModalProps) {
  const repair = useRepairUnit();
  const [notice, setNotice] = useState<string | null>(null);
  const isScrap = target?.action === 'scrap';
  const form = useForm({
    initialValues: { note: '', confirmScrap: false },
    validate: {
      note: checkNote,
      confirmScrap: (v) => (isScrap && !v ? 'Tick this to confirm the unit is scrapped for good.' : null),
    },
  });

  const close = () => {
    form.reset();
    setNotice(null);
    repair.reset();
    onClose();
  };

  const submit = form.onSubmit(({ note }) => {
    if (!target) return;
    setNotice(null);
    repair.mutate(
      { serial: target.serial, action: target.action, note: note.trim() },
      {
        onSuccess: () => {
          notifications.show({ color: 'signalGreen', title: ACTION_WORDS[target.action].title, message: `${target.serial} ${ACTION_WORDS[target.action].done}.` });
          close();
        },
        onError: (err) => setNotice(describeRepairError(err)),
      },
    );
  });

  const words = target ? ACTION_WORDS[target.action] : null;
  return (
    <Modal opened={target !== null} onClose={close} title={words && target ? `${words.title}: ${target.serial}` : 'Repair step'}>
      {target && words && (
        <form onSubmit={submit} noValidate>
          <Stack gap="md">
            <Text size="sm" c="dimmed">
              {EXPLAIN[target.action]}
            </Text>
            {/* a fixed height: Mantine's autosize watches document.fonts, which jsdom lacks */}
            <Textarea
              label="Repair note"
              description={`What you found or did (kept in the audit trail), up to ${NOTE_MAX} characters`}
              rows={4}
              withAsterisk
              data-autofocus
              {...form.getInputProps('note')}
            />
            {isScrap && (
              <Checkbox
                label={`Yes, scrap ${target.serial} for good; it will never be tested again`}
                {...form.getInputProps('confirmScrap', { type: 'checkbox' })}
              />
            )}
            {notice && (
              <Alert color="signalRed" variant="light" role="alert">
                {notice}
              </Alert>
            )}
            <Group justify="flex-end" gap="sm">
              <Button variant="default" onClick={close}>
                Cancel
              </Button>
              <Button type="submit" color={isScrap ? 'signalRed' : undefined} loading={repair.isPending}>
                {words.submit}
              </Button>
            </Group>
          </Stack>
        </form>
      )}
    </Modal>
  );
}
