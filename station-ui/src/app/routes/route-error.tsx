import { Alert, Button, Container, Text } from '@mantine/core';
import { IconAlertCircle } from '@tabler/icons-react';
import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { NotAllowed } from '@/components/layout/not-allowed';
import { isApiError } from '@/lib/api-client';

/** A chunk that no longer exists on the server: the app was updated while this tab stayed open. */
function isStaleChunk(error: unknown): boolean {
  return error instanceof Error && /dynamically imported module|Importing a module script failed|Failed to fetch/i.test(error.message);
}

/** What a page shows when it fails to load or to render. */
export function RouteError() {
  const error = useRouteError();
  if (isApiError(error) && error.status === 403) return <NotAllowed serverMessage={error.message} />;

  let title = 'This screen ran into a problem';
  let message = 'Something unexpected happened while showing this page. Reloading usually helps; no measurement is lost.';
  if (isStaleChunk(error)) {
    title = 'Railwright was updated';
    message = 'A newer version is on the station server. Reload the page to use it.';
  } else if (isRouteErrorResponse(error)) {
    message = `${error.status} ${error.statusText}`;
  } else if (isApiError(error)) {
    message = error.message;
  }
  return (
    <Container size="sm" py="xl">
      <Alert color="signalRed" variant="light" title={title} icon={<IconAlertCircle aria-hidden />} role="alert">
        <Text>{message}</Text>
        <Button mt="md" variant="default" onClick={() => window.location.reload()}>
          Reload the page
        </Button>
      </Alert>
    </Container>
  );
}
