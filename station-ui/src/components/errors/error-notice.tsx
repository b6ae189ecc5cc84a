import { Alert, Button } from '@mantine/core';
import { IconAlertCircle, IconRefresh } from '@tabler/icons-react';
import { isApiError } from '@/lib/api-client';
import { NotAllowed } from '@/components/layout/not-allowed';

interface ErrorNoticeProps {
  error: unknown;
  /** Heading above the message, e.g. "Users could not be loaded" */
  title: string;
  onRetry?: () => void;
}

/**
 * How a failed request shows on a page: a 403 becomes the not-allowed page, anything else a red
 * notice with the server's message and a way to try again.
 */
export function ErrorNotice({ error, title, onRetry }: ErrorNoticeProps) {
  if (isApiError(error) && error.status === 403) return <NotAllowed serverMessage={error.message} />;
  const message =
    error instanceof Error ? error.message : 'Something unexpected happened. Try again; nothing you entered was sent.';
  return (
    <Alert color="signalRed" variant="light" title={title} icon={<IconAlertCircle aria-hidden />} role="alert">
      {message}
      {onRetry && (
        <div>
          <Button mt="sm" size="xs" variant="default" leftSection={<IconRefresh size={16} aria-hidden />} onClick={onRetry}>
            Try again
          </Button>
        </div>
      )}
    </Alert>
  );
}
