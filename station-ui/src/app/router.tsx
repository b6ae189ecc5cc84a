import type { QueryClient } from '@tanstack/react-query';
import type { ComponentType } from 'react';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { pages, paths } from '@/config/paths';
import { setUnauthorizedHandler } from '@/lib/api-client';
import { clearSession, sessionNotice } from '@/lib/auth';
import { RouteError } from './routes/route-error';

type LazyModule = { default: ComponentType };

/** Each screen is its own chunk: the operator's station does not download the admin screens. */
const lazyPage = (load: () => Promise<LazyModule>) => async () => ({ Component: (await load()).default });

/**
 * The app shell (navigation, header, its icons, the wall-board switch) is a chunk of its own too, loaded with
 * the first page behind sign-in: the sign-in page loads only the entry and its own chunk (issue 11).
 */
const lazyShell = async () => {
  const [{ AppRoot }, { Notifications }] = await Promise.all([import('./routes/app-root'), import('@mantine/notifications')]);
  return {
    Component: function Shell() {
      return (
        <>
          <Notifications position="top-right" autoClose={5000} />
          <AppRoot />
        </>
      );
    },
  };
};

export const routes: RouteObject[] = [
  {
    path: paths.signIn.path,
    lazy: lazyPage(() => import('./routes/sign-in')),
    errorElement: <RouteError />,
  },
  {
    path: paths.home.path,
    lazy: lazyShell,
    errorElement: <RouteError />,
    children: [
      {
        // Errors inside a page stay inside the shell, so navigation keeps working.
        errorElement: <RouteError />,
        children: [
          { index: true, lazy: lazyPage(() => import('./routes/home')) },
          { path: pages.station.path, lazy: lazyPage(() => import('./routes/station')) },
          { path: pages.board.path, lazy: lazyPage(() => import('./routes/board')) },
          { path: pages.repair.path, lazy: lazyPage(() => import('./routes/repair')) },
          { path: pages.plans.path, lazy: lazyPage(() => import('./routes/plans')) },
          { path: pages.characterization.path, lazy: lazyPage(() => import('./routes/characterization')) },
          { path: pages.fixtures.path, lazy: lazyPage(() => import('./routes/fixtures')) },
          { path: pages.lots.path, lazy: lazyPage(() => import('./routes/lots')) },
          { path: pages.runs.path, lazy: lazyPage(() => import('./routes/runs')) },
          { path: paths.runDetail.path, lazy: lazyPage(() => import('./routes/run-detail')) },
          { path: pages.quality.path, lazy: lazyPage(() => import('./routes/quality')) },
          { path: pages.holds.path, lazy: lazyPage(() => import('./routes/holds')) },
          { path: pages.audit.path, lazy: lazyPage(() => import('./routes/audit')) },
          { path: paths.unitHistory.path, lazy: lazyPage(() => import('./routes/unit-history')) },
          { path: pages.adminUsers.path, lazy: lazyPage(() => import('./routes/admin/users')) },
          { path: paths.notFound.path, lazy: lazyPage(() => import('./routes/not-found')) },
        ],
      },
    ],
  },
];

/** Builds the router and routes every 401 through it to the sign-in page, remembering the address. */
export function createAppRouter(queryClient: QueryClient) {
  const router = createBrowserRouter(routes);
  setUnauthorizedHandler((error) => {
    const { pathname, search } = router.state.location;
    if (pathname === paths.signIn.path) return;
    clearSession(queryClient);
    // A deactivated account gets the server's explanation; an expired token needs none.
    sessionNotice.set(error.code === 'account_deactivated' ? error.message : undefined);
    void router.navigate(paths.signIn.href(pathname + search), { replace: true });
  });
  return router;
}
