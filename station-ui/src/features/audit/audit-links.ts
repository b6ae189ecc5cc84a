import { pages, paths } from '@/config/paths';
import type { AuditLink } from './api/audit-types';

/** Where a record's object opens in this app, or null when it has no page (e.g. a product, a discarded draft). */
export function auditLinkHref(link: AuditLink | null): string | null {
  if (!link) return null;
  switch (link.kind) {
    case 'plan_version':
      return link.planId ? `${pages.plans.href()}?plan=${link.planId}&version=${encodeURIComponent(link.id)}` : pages.plans.href();
    case 'unit':
      return link.serial ? paths.unitHistory.href(link.serial) : null;
    case 'run':
      return /^\d+$/.test(link.id) ? paths.runDetail.href(Number(link.id)) : null;
    case 'fixture':
    case 'calibration':
      return `${pages.fixtures.href()}?fixture=${encodeURIComponent(link.id)}`;
    case 'lot':
      return `${pages.lots.href()}?lot=${encodeURIComponent(link.id)}`;
    case 'user':
      return pages.adminUsers.href();
    case 'hold':
    case 'hold_rule':
      return pages.holds.href();
    default:
      return null;
  }
}
