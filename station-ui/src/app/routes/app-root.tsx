import { Center, Loader, Stack, Text } from '@mantine/core';
import { useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useEffect, useMemo, useRef } from 'react';
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { AppLayout } from '@/components/layout/app-layout';
import { NotAllowed } from '@/components/layout/not-allowed';
import { pageForPathname, pages, paths } from '@/config/paths';
import { isApiError, tokenStore } from '@/lib/api-client';
import { canOpen, clearSession, sessionNotice, useUser } from '@/lib/auth';
import { displayTokenFor } from '@/features/board/board-display';

// the wall screen's board, without the app frame; its own chunk like every page
const WallBoard = lazy(() => import('@/features/board/components/board-screen').then((m) => ({ default: m.BoardScreen })));

/**
 * Everything behind sign-in: asks who is signed in, sends strangers to the sign-in page (keeping the
 * address to come back to) and shows "not allowed" instead of pages the person's roles do not open.
 */
export function AppRoot() {
  const location = useLocation();
  const queryClient = useQueryClient();
  // Signing out on purpose goes to a plain sign-in page, without "come back here afterwards".
  const signingOut = useRef(false);
  const here = location.pathname + location.search;
  const page = pageForPathname(location.pathname);
  // `/board?display=<token>`: a wall screen with a board-only token never goes to the sign-in page
  const displayToken = useMemo(
    () => (location.pathname === pages.board.path ? displayTokenFor(location.search, !!tokenStore.get()) : null),
    [location.pathname, location.search],
  );
  // the wall screen asks nobody who is signed in: a stale personal token must not send it to sign in
  const me = useUser({ enabled: !displayToken });

  // The tab title names the screen, so several open tabs can be told apart.
  useEffect(() => {
    document.title = page ? `${page.label} · Railwright` : 'Railwright';
  }, [page]);

  if (displayToken) {
    return (
      <Suspense fallback={<Loader aria-label="Loading the board" />}>
        <WallBoard displayToken={displayToken} />
      </Suspense>
    );
  }
  if (me.isPending) {
    return (
      <Center h="100vh">
        <Loader aria-label="Checking who is signed in" />
      </Center>
    );
  }
  if (me.isError) {
    // The API client has already gone to sign in; this covers a render that comes first.
    if (isApiError(me.error) && me.error.status === 401) {
      if (!sessionNotice.get()) sessionNotice.set(me.error.code === 'account_deactivated' ? me.error.message : undefined);
      return <Navigate to={paths.signIn.href(here)} replace />;
    }
    return (
      <Center h="100vh" p="lg">
        <Stack maw={560}>
          <ErrorNotice error={me.error} title="Railwright cannot start" onRetry={() => me.refetch()} />
          <Text c="dimmed" size="sm">
            The screen needs the station server to tell it who is signed in.
          </Text>
        </Stack>
      </Center>
    );
  }
  if (!me.data) return <Navigate to={paths.signIn.href(signingOut.current ? undefined : here)} replace />;

  const allowed = !page || canOpen(me.data, page);

  const signOut = () => {
    signingOut.current = true;
    sessionNotice.clear();
    // Clearing the session re-renders this component without a user, which redirects.
    clearSession(queryClient);
  };

  return (
    <AppLayout user={me.data} onSignOut={signOut}>
      {allowed ? <Outlet /> : <NotAllowed />}
    </AppLayout>
  );
}
