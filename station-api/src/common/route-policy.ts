import type { Role } from '../users/user.entity';

/**
 * THE route-by-role policy of the station API, in one table (documented in docs/security.md).
 * The `@Roles(...)` / `@Public()` declarations on the controllers must say the same: the route × role
 * matrix test (test/security-route-matrix.e2e-spec.ts) reads every route from the running application,
 * fails on a route missing here or without a declaration, and checks every cell against this table.
 */
export type RouteAccess = 'public' | readonly Role[];

export interface RoutePolicy {
  /** Who may call it: `public` (no token), or the roles of which one suffices */
  allow: RouteAccess;
  /** A board display token (POST /api/auth/board-token) also opens it */
  boardDisplay?: true;
}

const ALL: readonly Role[] = ['operator', 'engineer', 'quality', 'admin'];
const TESTERS: readonly Role[] = ['operator', 'engineer', 'admin'];
const ENGINEERING: readonly Role[] = ['engineer', 'admin'];

/** Key: `METHOD /api/path` with Express parameters (`:id`), exactly as the router has it. */
export const ROUTE_POLICY: Readonly<Record<string, RoutePolicy>> = {
  // sign-in
  'POST /api/auth/login': { allow: 'public' },
  'GET /api/auth/me': { allow: ALL },
  'POST /api/auth/board-token': { allow: ['admin'] },
  // users and audit
  'GET /api/users': { allow: ['admin'] },
  'POST /api/users': { allow: ['admin'] },
  'PATCH /api/users/:id': { allow: ['admin'] },
  'POST /api/users/:id/password': { allow: ['admin'] },
  // audit trail and unit history (H3): engineers, quality and admin read the trail; sign-ins are filtered to admin inside
  'GET /api/audit': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/audit/export': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/audit/choices': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/units/:serial/history': { allow: ALL },
  // master data
  'GET /api/products': { allow: ALL },
  'GET /api/products/:id': { allow: ALL },
  'POST /api/products': { allow: ENGINEERING },
  'PATCH /api/products/:id': { allow: ENGINEERING },
  'GET /api/fixtures': { allow: ALL },
  'GET /api/fixtures/:id': { allow: ALL },
  'POST /api/fixtures': { allow: ENGINEERING },
  'PATCH /api/fixtures/:id': { allow: ENGINEERING },
  'POST /api/fixtures/:id/calibrations': { allow: ENGINEERING },
  'POST /api/fixtures/:id/contacts-replaced': { allow: ENGINEERING },
  // fixtures and calibration (issue 10, H2): records are read by engineering and quality, written by engineering
  'GET /api/fixtures/calibration-quantities': { allow: ALL },
  'GET /api/fixtures/:id/calibrations': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/fixtures/:id/calibrations/:calibrationId/certificate': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/stations': { allow: ALL },
  'GET /api/stations/:id': { allow: ALL },
  'POST /api/stations': { allow: ENGINEERING },
  // quality may set the active lot; changing the fixture is refused to quality inside (FIXTURE_ASSIGNERS)
  'PATCH /api/stations/:id': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/lots': { allow: ALL },
  'GET /api/lots/:id': { allow: ALL },
  'POST /api/lots': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/units/:serial': { allow: ALL },
  // lots (issue 12, H4): creation by file, export, units, release with its certificate, close
  'GET /api/lots/export.csv': { allow: ['engineer', 'quality', 'admin'] },
  'POST /api/lots/import': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/lots/:id/units': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/lots/:id/release-check': { allow: ['engineer', 'quality', 'admin'] },
  'POST /api/lots/:id/release': { allow: ['quality', 'admin'] },
  'POST /api/lots/:id/close': { allow: ['quality', 'admin'] },
  'GET /api/lots/:id/certificate.pdf': { allow: ['engineer', 'quality', 'admin'] },
  // plans: admin may do everything engineers may
  'GET /api/plans': { allow: ALL },
  'POST /api/plans/validate': { allow: ENGINEERING },
  'GET /api/plans/:id': { allow: ALL },
  'POST /api/plans/:id/versions': { allow: ENGINEERING },
  'GET /api/plan-versions/:id': { allow: ALL },
  'POST /api/plan-versions/:id/release': { allow: ENGINEERING },
  'GET /api/plan-step-kinds': { allow: ALL },
  'POST /api/plans/import': { allow: ENGINEERING },
  'POST /api/plans/:id/preview': { allow: ENGINEERING },
  'PATCH /api/plan-versions/:id': { allow: ENGINEERING },
  'PUT /api/plan-versions/:id': { allow: ENGINEERING },
  'DELETE /api/plan-versions/:id': { allow: ENGINEERING },
  'POST /api/plan-versions/:id/submit': { allow: ENGINEERING },
  'POST /api/plan-versions/:id/retire': { allow: ENGINEERING },
  'POST /api/plan-versions/:id/drafts': { allow: ENGINEERING },
  'GET /api/plan-versions/:from/compare/:to': { allow: ALL },
  'GET /api/plan-versions/:id/export': { allow: ALL },
  'POST /api/plan-versions/:id/what-if': { allow: ENGINEERING },
  // testing at a station
  'GET /api/stations/:id/status': { allow: ALL },
  'POST /api/stations/:id/scan': { allow: TESTERS },
  'POST /api/stations/:id/runs': { allow: TESTERS },
  'GET /api/runs': { allow: ALL },
  'GET /api/runs/:id': { allow: ALL },
  'POST /api/runs/:id/abort': { allow: TESTERS },
  // shop floor, board and repair
  'GET /api/stations/:id/shift-summary': { allow: ALL },
  'GET /api/board': { allow: ALL, boardDisplay: true },
  'GET /api/runs/:id/repair-tag.pdf': { allow: ALL },
  'GET /api/repair-queue': { allow: ALL },
  'POST /api/units/:serial/repair': { allow: ['engineer', 'quality', 'admin'] },
  'POST /api/units/:serial/send-to-repair': { allow: TESTERS },
  // repair records and causes (H6, issue 12): engineers maintain the causes; repair staff write records
  'GET /api/repair-causes': { allow: ALL },
  'POST /api/repair-causes': { allow: ENGINEERING },
  'PATCH /api/repair-causes/:id': { allow: ENGINEERING },
  'DELETE /api/repair-causes/:id': { allow: ENGINEERING },
  'GET /api/repair-records': { allow: ALL },
  'GET /api/repair-records/pareto': { allow: ALL },
  'POST /api/repair-records/:id/corrections': { allow: ['engineer', 'quality', 'admin'] },
  // yield and capability (read-only aggregates)
  'GET /api/yield/figures': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/yield/pareto': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/yield/pareto/units': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/yield/quantities': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/yield/capability': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/yield/control-chart': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/yield/measurements.csv': { allow: ['engineer', 'quality', 'admin'] },
  // holds and alerts (issue 12): rules, holds, alerts and outbox for engineers and quality; lifting for quality only
  'GET /api/hold-rules': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/hold-rules/quantities': { allow: ['engineer', 'quality', 'admin'] },
  'POST /api/hold-rules': { allow: ['engineer', 'quality', 'admin'] },
  'PATCH /api/hold-rules/:id': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/holds': { allow: ['engineer', 'quality', 'admin'] },
  'POST /api/holds/:id/lift': { allow: ['quality', 'admin'] },
  'GET /api/hold-alerts': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/outbox': { allow: ['engineer', 'quality', 'admin'] },
  // H1: limits from characterization data (issue 10): engineers upload and accept, quality may read
  'POST /api/characterization/data-sets': { allow: ENGINEERING },
  'GET /api/characterization/data-sets': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/characterization/data-sets/:id': { allow: ['engineer', 'quality', 'admin'] },
  'GET /api/characterization/data-sets/:id/analysis': { allow: ['engineer', 'quality', 'admin'] },
  'POST /api/characterization/data-sets/:id/accept': { allow: ENGINEERING },
};

/** Live events (socket.io): who may join which room. Rights are checked again on every join. */
export const SOCKET_POLICY = {
  /** `station:<id>` (the station must exist): the roles that may test at a station */
  stationRoom: TESTERS,
  /** `board`: every role, and board display tokens */
  boardRoom: ALL,
} as const;

export function routeKey(method: string, path: string): string {
  return `${method.toUpperCase()} ${path}`;
}

/** Whether a board display token opens this route (looked up by the matched Express route path). */
export function boardDisplayMayUse(method: string, routePath: string | undefined): boolean {
  return routePath !== undefined && ROUTE_POLICY[routeKey(method, routePath)]?.boardDisplay === true;
}
