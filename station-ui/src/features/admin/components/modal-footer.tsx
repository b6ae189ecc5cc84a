import { Alert, Button, Group } from '@mantine/core';

interface ModalFooterProps {
  /** What went wrong on the last save, in words for the admin; nothing shown when null */
  notice: string | null;
  onCancel: () => void;
  submitLabel: string;
  /** The save is on its way: the submit button shows it is busy */
  submitting: boolean;
}

/** The end of every user form here: the refusal notice (if any), then Cancel and the submit button. */
export function ModalFooter({ notice, onCancel, submitLabel, submitting }: ModalFooterProps) {
  return (
    <>
      {notice && (
        <Alert color="signalRed" variant="light" role="alert">
          {notice}
        </Alert>
      )}
      <Group justify="flex-end" gap="sm">
        <Button variant="default" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" loading={submitting}>
          {submitLabel}
        </Button>
      </Group>
    </>
  );
}
