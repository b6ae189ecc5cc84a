import { Alert, Button, CopyButton, Group, Modal, Stack, Text, TextInput } from '@mantine/core';
import { useState, type FormEvent } from 'react';
import { boardDisplayHref } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { useCreateBoardToken } from '../api/create-board-token';

const LABEL_MAX = 80;

function describeError(error: unknown): string {
  if (!isApiError(error)) return 'The link could not be made. Try again.';
  if (error.status === 403) return 'Only administrators can make board display links.';
  return error.message;
}

/**
 * Admin → "Board display link": issues a board-only token for a wall screen and shows the address to open
 * on it. The link shows the board alone, for 30 days, and never asks anyone to sign in.
 */
export function BoardLinkModal({ opened, onClose }: { opened: boolean; onClose: () => void }) {
  const create = useCreateBoardToken();
  const [label, setLabel] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const url = create.data ? `${window.location.origin}${boardDisplayHref(create.data.token)}` : null;

  const close = () => {
    create.reset();
    setLabel('');
    setProblem(null);
    onClose();
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const text = label.trim();
    if (text.length === 0) return setProblem('Name the screen the link is for, e.g. "Hall B, above line 2".');
    if (text.length > LABEL_MAX) return setProblem(`Keep the name to ${LABEL_MAX} characters (now ${text.length}).`);
    setProblem(null);
    create.mutate({ label: text });
  };

  return (
    <Modal opened={opened} onClose={close} title="Board display link" size="lg">
      {url && create.data ? (
        <Stack gap="sm">
          <Text size="sm">
            Open this address on the wall screen. It shows the line board only, stays signed in, and stops working on{' '}
            <strong>{new Date(create.data.expiresAt).toLocaleDateString()}</strong>.
          </Text>
          <TextInput label="Board address" value={url} readOnly onFocus={(e) => e.currentTarget.select()} />
          <Group justify="flex-end">
            <CopyButton value={url}>{({ copied, copy }) => <Button onClick={copy}>{copied ? 'Copied' : 'Copy address'}</Button>}</CopyButton>
            <Button variant="default" onClick={close}>
              Done
            </Button>
          </Group>
        </Stack>
      ) : (
        <form onSubmit={submit} noValidate>
          <Stack gap="sm">
            <Text size="sm">A link for one wall screen: it opens the line board without signing in, for 30 days.</Text>
            <TextInput
              label="Which screen is it for?"
              placeholder="Hall B, above line 2"
              value={label}
              onChange={(e) => setLabel(e.currentTarget.value)}
              error={problem}
              data-autofocus
            />
            {create.isError && (
              <Alert color="signalRed" variant="light" role="alert">
                {describeError(create.error)}
              </Alert>
            )}
            <Group justify="flex-end" gap="sm">
              <Button variant="default" onClick={close}>
                Cancel
              </Button>
              <Button type="submit" loading={create.isPending}>
                Make link
              </Button>
            </Group>
          </Stack>
        </form>
      )}
    </Modal>
  );
}
