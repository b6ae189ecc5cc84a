import { matchPath } from 'react-router-dom';
import type { Role } from './roles';

/**
 * A page people reach from the navigation. `roles` lists who may open it; admin is added to every
 * page because an administrator sees everything.
 */
export interface PageDef {
  readonly path: string;
  readonly label: string;
  readonly roles: readonly Role[];
  readonly group: NavGroup;
  readonly href: () => string;
}

export type NavGroup = 'floor' | 'engineering' | 'quality' | 'admin';

export const navGroupLabels: Record<NavGroup, string> = {
  floor: 'Test floor',
  engineering: 'Engineering',
  quality: 'Quality',
  admin: 'Administration',
};

function page(path: string, label: string, group: NavGroup, roles: readonly Role[]): PageDef {
  const withAdmin: readonly Role[] = roles.includes('admin') ? roles : [...roles, 'admin'];
  return { path, label, group, roles: withAdmin, href: () => path };
}

/**
 * Every page in the app, in navigation order. Only this file writes URL strings; everything else
 * asks it for them.
 */
export const pages = {
  station: page('/station', 'Station', 'floor', ['operator', 'engineer']),
  board: page('/board', 'Board', 'floor', ['operator', 'engineer', 'quality']),
  repair: page('/repair', 'Repair', 'floor', ['engineer', 'quality']),
  plans: page('/plans', 'Plans', 'engineering', ['engineer']),
  characterization: page('/limits-from-data', 'Limits from data', 'engineering', ['engineer']),
  fixtures: page('/fixtures', 'Fixtures', 'engineering', ['engineer']),
  lots: page('/lots', 'Lots', 'engineering', ['engineer', 'quality']),
  runs: page('/runs', 'Runs', 'engineering', ['engineer', 'quality']),
  quality: page('/quality', 'Quality', 'quality', ['engineer', 'quality']),
  holds: page('/holds', 'Holds and alerts', 'quality', ['engineer', 'quality']),
  audit: page('/audit', 'Audit trail', 'quality', ['engineer', 'quality']),
  adminUsers: page('/admin/users', 'Users', 'admin', ['admin']),
} as const satisfies Record<string, PageDef>;

export type PageKey = keyof typeof pages;

export const pageList: readonly PageDef[] = Object.values(pages);

/** Pages that are not in the navigation. */
export const paths = {
  home: { path: '/', href: () => '/' },
  signIn: {
    path: '/sign-in',
    /** `next` is the address to return to after signing in. */
    href: (next?: string | null) => (next && next !== '/' ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in'),
  },
  /** One run with its traceability and every measurement (same roles as Runs: it sits under /runs). */
  runDetail: { path: '/runs/:id', href: (id: number) => `/runs/${id}` },
  /** One unit's whole history (every run, measurement, repair and disposition), reached by serial. */
  unitHistory: { path: '/units/:serial', href: (serial: string) => `/units/${encodeURIComponent(serial)}` },
  notFound: { path: '*' },
} as const;

/** The page (and so the allowed roles) an address belongs to, if any. */
export function pageForPathname(pathname: string): PageDef | undefined {
  return pageList.find((p) => matchPath({ path: p.path, end: false }, pathname) !== null);
}

/**
 * Accepts only an address inside this app as a return target, so a crafted sign-in link cannot send
 * people to another site after they sign in.
 */
export function safeNextPath(next: string | null | undefined): string | null {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return null;
  if (next.startsWith(paths.signIn.path)) return null;
  return next;
}

/** Where the API lives, relative to the page (the dev server proxies it; production serves both). */
export const apiBase = '/api';

/** The wall screen's address with its board-only token (`/board?display=<token>`, issued by an administrator). */
export const BOARD_DISPLAY_PARAM = 'display';
export const boardDisplayHref = (token: string): string => `${pages.board.path}?${BOARD_DISPLAY_PARAM}=${encodeURIComponent(token)}`;

export const apiPaths = {
  login: '/auth/login',
  /** admin only: a board-only token for a wall screen, `{ label }` → `{ token, expiresAt }` */
  boardToken: '/auth/board-token',
  me: '/auth/me',
  users: '/users',
  user: (id: number) => `/users/${id}`,
  userPassword: (id: number) => `/users/${id}/password`,
  audit: '/audit',
  // the operator station and the board (docs/architecture.md, "Runs: REST and live events")
  stations: '/stations',
  stationStatus: (id: number) => `/stations/${id}/status`,
  stationScan: (id: number) => `/stations/${id}/scan`,
  stationRuns: (id: number) => `/stations/${id}/runs`,
  stationShiftSummary: (id: number) => `/stations/${id}/shift-summary`,
  run: (id: number) => `/runs/${id}`,
  runAbort: (id: number) => `/runs/${id}/abort`,
  runRepairTag: (id: number) => `/runs/${id}/repair-tag.pdf`,
  /** the operator sends a failed unit to repair although it has attempts left */
  unitSendToRepair: (serial: string) => `/units/${encodeURIComponent(serial)}/send-to-repair`,
  // the runs list (filters: stationId, lotId, serial, verdict, from, to, limit, offset) and its filter choices
  runs: '/runs',
  lots: '/lots',
  board: '/board',
  // the repair loop: the queue and one unit's repair step (receive, return for retest, scrap)
  repairQueue: '/repair-queue',
  unitRepair: (serial: string) => `/units/${encodeURIComponent(serial)}/repair`,
  // test plans and their versions (features/plans)
  plans: '/plans',
  plan: (id: number) => `/plans/${id}`,
  planPreview: (id: number) => `/plans/${id}/preview`,
  planImport: '/plans/import',
  planStepKinds: '/plan-step-kinds',
  /** one plan version (the editor; the station reads how many attempts it allows) */
  planVersion: (id: number) => `/plan-versions/${id}`,
  planVersionDrafts: (id: number) => `/plan-versions/${id}/drafts`,
  planVersionSubmit: (id: number) => `/plan-versions/${id}/submit`,
  planVersionRelease: (id: number) => `/plan-versions/${id}/release`,
  planVersionRetire: (id: number) => `/plan-versions/${id}/retire`,
  planVersionExport: (id: number) => `/plan-versions/${id}/export`,
  planCompare: (from: number, to: number) => `/plan-versions/${from}/compare/${to}`,
  planWhatIf: (id: number) => `/plan-versions/${id}/what-if`,
  // lots (issue 12, H4): one lot, its units, release and its certificate, close, the lot file in and out
  lot: (id: number) => `/lots/${id}`,
  lotUnits: (id: number) => `/lots/${id}/units`,
  lotReleaseCheck: (id: number) => `/lots/${id}/release-check`,
  lotRelease: (id: number) => `/lots/${id}/release`,
  lotClose: (id: number) => `/lots/${id}/close`,
  lotCertificate: (id: number) => `/lots/${id}/certificate.pdf`,
  lotsImport: '/lots/import',
  lotsExport: '/lots/export.csv',
  /** the products a new lot can be opened for */
  products: '/products',
  // holds and alerts (issue 12, features/holds): rules per product, holds and lifting, alerts, the e-mail outbox
  holdRules: '/hold-rules',
  holdRule: (id: number) => `/hold-rules/${id}`,
  holdRuleQuantities: '/hold-rules/quantities',
  holds: '/holds',
  holdLift: (id: number) => `/holds/${id}/lift`,
  holdAlerts: '/hold-alerts',
  outbox: '/outbox',
  // H1: limits from characterization data (features/characterization): upload (multipart) and list, one data set,
  // the figures of one quantity, accepting proposed limits into a draft
  characterizationDataSets: '/characterization/data-sets',
  characterizationDataSet: (id: number) => `/characterization/data-sets/${id}`,
  characterizationAnalysis: (id: number) => `/characterization/data-sets/${id}/analysis`,
  characterizationAccept: (id: number) => `/characterization/data-sets/${id}/accept`,
  // fixtures and calibration (issue 10, H2): records with their certificate PDFs, the contact reset
  fixtures: '/fixtures',
  fixture: (id: number) => `/fixtures/${id}`,
  fixtureCalibrations: (id: number) => `/fixtures/${id}/calibrations`,
  fixtureCertificate: (fixtureId: number, calibrationId: number) => `/fixtures/${fixtureId}/calibrations/${calibrationId}/certificate`,
  fixtureContactsReplaced: (id: number) => `/fixtures/${id}/contacts-replaced`,
  calibrationQuantities: '/fixtures/calibration-quantities',
  // H3: audit trail (filters: entityType, entityId, user, action, q, from, to; list also limit, offset) and unit history
  auditExport: '/audit/export',
  auditChoices: '/audit/choices',
  unit: (serial: string) => `/units/${encodeURIComponent(serial)}`,
  unitHistory: (serial: string) => `/units/${encodeURIComponent(serial)}/history`,
  // H6 (issue 12): repair causes (engineers maintain them), repair records, corrections and the Pareto by cause
  repairCauses: '/repair-causes',
  repairCause: (id: number) => `/repair-causes/${id}`,
  repairRecords: '/repair-records',
  repairRecordCorrections: (id: number) => `/repair-records/${id}/corrections`,
  repairPareto: '/repair-records/pareto',
} as const;
