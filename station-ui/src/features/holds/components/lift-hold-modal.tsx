import { Alert, Button, Checkbox, Group, Modal, Stack, Text, Textarea } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import { isApiError } from '@/lib/api-client';
import { useLiftHold } from '../api/lift-hold';
import type { Hold } from '../api/types';
import { checkLiftReason, REASON_MAX } from '../holds-words';

interface LiftHoldModalProps {
  /** The hold to lift; null keeps the dialog closed */
  hold: Hold | null;
  onClose: () => void;
}

/** Lifting a hold: a reason is required (it goes into the audit trail) and an explicit yes. */
export function LiftHoldModal({ hold, onClose }: LiftHoldModalProps) {
  const lift = useLiftHold();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm({
    initialValues: { reason: '', confirm: false },
    validate: {
      reason: checkLiftReason,
      confirm: (v) => (v ? null : 'Tick this to confirm that testing of the lot may go on.'),
    },
  });

  const close = () => {
    form.reset();
    setNotice(null);
    lift.reset();
    onClose();
  };

  const submit = form.onSubmit(({ reason }) => {
    if (!hold) return;
    setNotice(null);
    lift.mutate(
      { id: hold.id, reason: reason.trim() },
      {
        onSuccess: () => {
          notifications.show({ color: 'signalGreen', title: 'Hold lifted', message: `Lot ${hold.lotCode} is open for testing again.` });
          close();
        },
        onError: (err) => setNotice(isApiError(err) ? err.message : 'The station server could not be reached; the hold is still in place.'),
      },
    );
  });

  return (
    <Modal opened={hold !== null} onClose={close} title={hold ? `Lift the hold on lot ${hold.lotCode}` : ''} size="lg">
      {hold && (
        <form onSubmit={submit} noValidate>
          <Stack gap="md">
            <Text>
              On hold because: <strong>{hold.reason}</strong>
            </Text>
            <Text size="sm" c="dimmed">
              The stations may test this lot again as soon as you lift the hold. The hold rules then look only at tests after this moment.
            </Text>
            <Textarea
              label="Why may testing go on?"
              description="Kept in the audit trail with your name."
              rows={3}
              maxLength={REASON_MAX}
              required
              data-autofocus
              {...form.getInputProps('reason')}
            />
            <Checkbox label={`I confirm that testing of lot ${hold.lotCode} may go on`} {...form.getInputProps('confirm', { type: 'checkbox' })} />
            {notice && (
              <Alert color="signalRed" title="The hold was not lifted">
                {notice}
              </Alert>
            )}
            <Group justify="flex-end">
              <Button variant="default" onClick={close}>
                Keep the hold
              </Button>
              <Button type="submit" loading={lift.isPending}>
                Lift hold
              </Button>
            </Group>
          </Stack>
        </form>
      )}
    </Modal>
  );
}
