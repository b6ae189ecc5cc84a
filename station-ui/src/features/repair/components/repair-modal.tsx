import { Alert, Button, Checkbox, Group, Modal, Radio, Select, Stack, Text, Textarea } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import { useRepairCauses } from '../api/repair-causes';
import { useRepairUnit, type RepairAction } from '../api/repair-unit';
import type { QueueState } from '../api/repair-types';
import { ACTION_WORDS, checkNote, checkRecordText, describeRepairError, DISPOSITIONS, NOTE_MAX, RECORD_TEXT_MAX, type RepairStep } from '../repair-words';

export interface RepairTarget {
  serial: string;
  state: QueueState;
  step: RepairStep;
}

interface RepairModalProps {
  /** The unit and the form asked for; null keeps the dialog closed */
  target: RepairTarget | null;
  onClose: () => void;
}

/**
 * One repair step on one unit. Receive: a note. Record repair: symptom, cause (from the list engineers
 * maintain), action taken and the disposition (eligible for retest, or scrapped after an explicit yes).
 */
export function RepairModal({ target, onClose }: RepairModalProps) {
  const title = target ? `${target.step === 'receive' ? 'Receive into repair' : 'Record repair'}: ${target.serial}` : 'Repair step';
  return (
    <Modal opened={target !== null} onClose={onClose} title={title} size="lg">
      {target?.step === 'receive' && <ReceiveForm target={target} onDone={onClose} />}
      {target?.step === 'record' && <RecordForm target={target} onDone={onClose} />}
    </Modal>
  );
}

function useSend(target: RepairTarget, onDone: () => void) {
  const repair = useRepairUnit();
  const [notice, setNotice] = useState<string | null>(null);
  const send = (body: { action: RepairAction; note?: string; symptom?: string; causeId?: number; actionTaken?: string }) => {
    setNotice(null);
    repair.mutate(
      { serial: target.serial, ...body },
      {
        onSuccess: () => {
          notifications.show({ color: 'signalGreen', title: ACTION_WORDS[body.action].title, message: `${target.serial} ${ACTION_WORDS[body.action].done}.` });
          onDone();
        },
        onError: (err) => setNotice(describeRepairError(err)),
      },
    );
  };
  return { send, notice, pending: repair.isPending };
}

function Notice({ text }: { text: string | null }) {
  return text ? (
    <Alert color="signalRed" variant="light" role="alert">
      {text}
    </Alert>
  ) : null;
}

function ReceiveForm({ target, onDone }: { target: RepairTarget; onDone: () => void }) {
  const { send, notice, pending } = useSend(target, onDone);
  const form = useForm({ initialValues: { note: '' }, validate: { note: checkNote } });
  return (
    <form onSubmit={form.onSubmit(({ note }) => send({ action: 'receive', note: note.trim() }))} noValidate>
      <Stack gap="md">
        <Text size="sm" c="dimmed">
          The unit is on the repair bench from now on. The stations refuse it until its repair is recorded.
        </Text>
        {/* a fixed height: Mantine's autosize watches document.fonts, which jsdom lacks */}
        <Textarea label="Repair note" description={`Where it is and what you see first, up to ${NOTE_MAX} characters`} rows={3} withAsterisk data-autofocus {...form.getInputProps('note')} />
        <Notice text={notice} />
        <Group justify="flex-end" gap="sm">
          <Button variant="default" onClick={onDone}>
            Cancel
          </Button>
          <Button type="submit" loading={pending}>
            Receive
          </Button>
        </Group>
      </Stack>
    </form>
  );
}

function RecordForm({ target, onDone }: { target: RepairTarget; onDone: () => void }) {
  const { send, notice, pending } = useSend(target, onDone);
  const causes = useRepairCauses();
  // a unit still waiting has not been on the bench: it can only be scrapped (the server's rule)
  const canReturn = target.state === 'in_repair';
  const form = useForm({
    initialValues: { symptom: '', causeId: '', actionTaken: '', disposition: canReturn ? 'return' : 'scrap', confirmScrap: false },
    validate: {
      symptom: (v) => checkRecordText('what was wrong with the unit', v),
      causeId: (v) => (v ? null : 'Choose the cause from the list.'),
      actionTaken: (v) => checkRecordText('what was done to the unit', v),
      disposition: (v) => (v === 'return' || v === 'scrap' ? null : 'Choose what becomes of the unit.'),
      confirmScrap: (v, all) => (all.disposition === 'scrap' && !v ? 'Tick this to confirm the unit is scrapped for good.' : null),
    },
  });
  const isScrap = form.values.disposition === 'scrap';
  const submit = form.onSubmit((v) =>
    send({ action: v.disposition as RepairAction, symptom: v.symptom.trim(), causeId: Number(v.causeId), actionTaken: v.actionTaken.trim() }),
  );
  return (
    <form onSubmit={submit} noValidate>
      <Stack gap="md">
        <Textarea label="Symptom" description="What was wrong with the unit" rows={2} maxLength={RECORD_TEXT_MAX} withAsterisk data-autofocus {...form.getInputProps('symptom')} />
        <Select
          label="Cause"
          description="From the list engineers maintain"
          placeholder={causes.isPending ? 'Loading the causes…' : 'Choose a cause'}
          searchable
          withAsterisk
          data={(causes.data ?? []).map((c) => ({ value: String(c.id), label: c.name }))}
          error={causes.isError ? 'The causes could not be loaded' : undefined}
          {...form.getInputProps('causeId')}
        />
        <Textarea label="Action taken" description="What was done to the unit" rows={2} maxLength={RECORD_TEXT_MAX} withAsterisk {...form.getInputProps('actionTaken')} />
        <Radio.Group label="Disposition" withAsterisk {...form.getInputProps('disposition')}>
          <Stack gap={6} mt={6}>
            {DISPOSITIONS.map((d) => (
              <Radio
                key={d.value}
                value={d.value}
                label={d.label}
                description={d.value === 'return' && !canReturn ? 'Receive the unit onto the bench first' : d.hint}
                disabled={d.value === 'return' && !canReturn}
              />
            ))}
          </Stack>
        </Radio.Group>
        {isScrap && <Checkbox label={`Yes, scrap ${target.serial} for good; it will never be tested again`} {...form.getInputProps('confirmScrap', { type: 'checkbox' })} />}
        <Notice text={notice} />
        <Group justify="flex-end" gap="sm">
          <Button variant="default" onClick={onDone}>
            Cancel
          </Button>
          <Button type="submit" color={isScrap ? 'signalRed' : undefined} loading={pending}>
            {isScrap ? 'Record and scrap' : 'Record and return for retest'}
          </Button>
        </Group>
      </Stack>
    </form>
  );
}
