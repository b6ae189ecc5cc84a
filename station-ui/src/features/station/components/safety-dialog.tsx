import { Button, Group, Kbd, List, Modal, Stack, Text } from '@mantine/core';
import { useEffect, useRef, type KeyboardEvent } from 'react';

/**
 * A keystroke arriving this soon after the prompt opens is taken as the tail of the scan (some scanners
 * send Enter twice), not as the operator's answer. 350 ms: common practice, no source.
 */
export const SAFETY_KEY_GUARD_MS = 350;

export interface SafetyDialogProps {
  opened: boolean;
  /** The scanned unit, shown so the operator checks it is the one in the fixture */
  serial: string;
  partNumber?: string;
  /** An engineer's retest of a passed unit */
  overrideReason?: string;
  onConfirm: () => void;
  onCancel: () => void;
}

/**
 * The last check before power is applied. Enter or Space confirms, Esc cancels; nothing else starts the
 * test. The fixture is energised for the whole test and parts may be hot after full-load steps.
 */
export function SafetyDialog({ opened, serial, partNumber, overrideReason, onConfirm, onCancel }: SafetyDialogProps) {
  const openedAt = useRef(0);
  const answered = useRef(false);

  useEffect(() => {
    if (opened) {
      openedAt.current = performance.now();
      answered.current = false;
    }
  }, [opened]);

  const confirm = () => {
    if (answered.current) return;
    answered.current = true;
    onConfirm();
  };

  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key !== 'Enter' && e.key !== ' ') return;
    // the default would click the focused button a second time
    e.preventDefault();
    if (e.repeat || performance.now() - openedAt.current < SAFETY_KEY_GUARD_MS) return;
    const focused = document.activeElement as HTMLElement | null;
    if (focused?.dataset.action === 'cancel') {
      onCancel();
      return;
    }
    confirm();
  };

  return (
    <Modal
      opened={opened}
      onClose={onCancel}
      title="Before power is applied"
      size="lg"
      centered
      closeOnClickOutside={false}
      withCloseButton={false}
      styles={{ title: { fontSize: 28, fontWeight: 700 } }}
    >
      <div onKeyDown={onKeyDown} data-testid="safety-dialog">
        <Stack gap="md">
          <Text fz={22}>
            Unit <span style={{ fontFamily: 'var(--mantine-font-family-monospace)', fontWeight: 700 }}>{serial}</span>
            {partNumber ? ` (${partNumber})` : ''}
          </Text>
          {overrideReason && (
            <Text fz={18}>
              Retest of a passed unit. Reason: <em>{overrideReason}</em>
            </Text>
          )}
          <List fz={22} spacing="xs">
            <List.Item>The fixture lid is closed and the unit is clamped.</List.Item>
            <List.Item>Hands are clear of the fixture.</List.Item>
          </List>
          <Text fz={18} fw={700} c="signalAmber.8">
            The fixture is live for the whole test. After the full-load steps the unit and the clamp may be hot.
          </Text>
          <Group justify="space-between" mt="sm">
            <Button size="xl" variant="default" data-action="cancel" onClick={onCancel}>
              Cancel&nbsp;<Kbd size="lg">Esc</Kbd>
            </Button>
            <Button size="xl" data-autofocus data-action="confirm" onClick={confirm}>
              Apply power and test&nbsp;<Kbd size="lg">Enter</Kbd>
            </Button>
          </Group>
        </Stack>
      </div>
    </Modal>
  );
}
