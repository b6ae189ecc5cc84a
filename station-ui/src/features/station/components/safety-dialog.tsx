import { Button, Group, Kbd, List, Modal, Stack, Text } from '@mantine/core';
import type { MouseEvent } from 'react';
import { CONFIRM_KEY, type GuardHint } from '../safety-keys';
import classes from './station-screen.module.css';

export interface SafetyDialogProps {
  opened: boolean;
  /** The scanned unit, shown so the operator checks it is the one in the fixture */
  serial: string;
  partNumber?: string;
  /** The attempt this test would be, and how many the plan allows */
  attempt?: number;
  maxAttempts?: number;
  /** An engineer's retest of a passed unit */
  overrideReason?: string;
  /** Why the last key did nothing (Enter pressed, or the confirm key too soon after other keys) */
  hint?: GuardHint | null;
  /** A mouse or touch press on "Apply power and test" */
  onPointerConfirm: () => void;
  onCancel: () => void;
}

const hintWords: Record<GuardHint, string> = {
  not_enter: `Enter does not apply power. Press ${CONFIRM_KEY} to start the test.`,
  too_soon: `Keys were typed just before ${CONFIRM_KEY}. Take your hands off the keys, then press ${CONFIRM_KEY} once.`,
};

/**
 * The last check before power is applied. Only the confirm key ({@link CONFIRM_KEY}) or a mouse/touch
 * press on the button starts the test; the key rules live in safety-keys.ts (Enter never confirms; a
 * scan typed into the prompt cancels it and becomes the next scan). Esc cancels.
 */
export function SafetyDialog({ opened, serial, partNumber, attempt, maxAttempts, overrideReason, hint, onPointerConfirm, onCancel }: SafetyDialogProps) {
  // a keyboard "click" (Enter/Space on a focused button) has detail 0; only a real press counts
  const pointerOnly = (fn: () => void) => (e: MouseEvent<HTMLButtonElement>) => {
    if (e.detail > 0) fn();
  };
  return (
    <Modal
      opened={opened}
      onClose={onCancel}
      title="Before power is applied"
      size="lg"
      centered
      closeOnClickOutside={false}
      // Esc is handled by the prompt's key rules (hooks/use-safety-keys.ts), in front of everything else
      closeOnEscape={false}
      withCloseButton={false}
      styles={{ title: { fontSize: 28, fontWeight: 700 } }}
    >
      {/* the focus rests on the text, not on a button: no key can "press" anything */}
      <div data-testid="safety-dialog" tabIndex={-1} data-autofocus className={classes.safetyBody}>
        <Stack gap="md">
          <Text fz={22}>
            Unit <span className={classes.safetySerial}>{serial}</span>
            {partNumber ? ` (${partNumber})` : ''}
          </Text>
          {attempt !== undefined && (
            <Text fz={20} fw={700} data-testid="safety-attempt">
              {maxAttempts !== undefined ? `Attempt ${attempt} of ${maxAttempts}` : `Attempt ${attempt}`}
            </Text>
          )}
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
          <Text fz={20} data-testid="safety-key-help">
            Press <Kbd size="lg">{CONFIRM_KEY}</Kbd> to apply power, or <Kbd size="lg">Esc</Kbd> to cancel. Enter does not start the test. Scanning
            another label cancels this unit.
          </Text>
          <Text fz={18} fw={700} role="status" className={classes.safetyHint} data-visible={hint ? 'yes' : 'no'}>
            {hint ? hintWords[hint] : ' '}
          </Text>
          <Group justify="space-between" mt="sm">
            <Button size="xl" variant="default" data-action="cancel" onClick={onCancel}>
              Cancel&nbsp;<Kbd size="lg">Esc</Kbd>
            </Button>
            <Button size="xl" data-action="confirm" onClick={pointerOnly(onPointerConfirm)}>
              Apply power and test&nbsp;<Kbd size="lg">{CONFIRM_KEY}</Kbd>
            </Button>
          </Group>
        </Stack>
      </div>
    </Modal>
  );
}
