import { Button, Group, Kbd, Modal, Stack, Text, TextInput } from '@mantine/core';
import { useEffect, useState, type FormEvent } from 'react';

/** The server asks for at least five characters (StartRunDto.overrideReason). */
export const MIN_REASON_LENGTH = 5;

export interface OverrideDialogProps {
  opened: boolean;
  serial: string;
  onSubmit: (reason: string) => void;
  onCancel: () => void;
}

/** An engineer says why a unit that already passed is tested again; the reason goes to the audit trail. */
export function OverrideDialog({ opened, serial, onSubmit, onCancel }: OverrideDialogProps) {
  const [reason, setReason] = useState('');
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    if (opened) {
      setReason('');
      setProblem(null);
    }
  }, [opened]);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const text = reason.trim();
    if (text.length < MIN_REASON_LENGTH) {
      setProblem(`Write at least ${MIN_REASON_LENGTH} characters: why is this unit tested again?`);
      return;
    }
    onSubmit(text);
  };

  return (
    <Modal opened={opened} onClose={onCancel} title="Test a passed unit again" size="lg" centered styles={{ title: { fontSize: 26, fontWeight: 700 } }}>
      <form onSubmit={submit} noValidate>
        <Stack gap="md">
          <Text fz={20}>
            <span style={{ fontFamily: 'var(--mantine-font-family-monospace)', fontWeight: 700 }}>{serial}</span> has already passed.
            Your reason is stored with the run.
          </Text>
          <TextInput
            data-autofocus
            size="lg"
            label="Reason for the retest"
            placeholder="e.g. rework after a customer return"
            value={reason}
            onChange={(e) => {
              setReason(e.currentTarget.value);
              setProblem(null);
            }}
            error={problem}
            maxLength={500}
          />
          <Group justify="space-between">
            <Button size="lg" variant="default" onClick={onCancel}>
              Cancel&nbsp;<Kbd>Esc</Kbd>
            </Button>
            <Button size="lg" type="submit">
              Continue&nbsp;<Kbd>Enter</Kbd>
            </Button>
          </Group>
        </Stack>
      </form>
    </Modal>
  );
}
