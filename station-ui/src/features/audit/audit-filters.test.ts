import { describe, expect, it } from 'vitest';
import { auditFiltersFromParams, auditParamsFrom, auditQueryFrom, emptyAuditFilters, localDayStart, rangeProblem } from './audit-filters';
import { auditLinkHref } from './audit-links';

describe('audit filters in the address', () => {
  it('reads and writes the same filters, dropping empty ones', () => {
    const params = new URLSearchParams('type=unit&id=K5A-2649-00017&user=engineer&q=vout&from=2026-12-01&to=2026-12-02&page=3');
    const { filters, page } = auditFiltersFromParams(params);
    expect(filters).toEqual({ type: 'unit', id: 'K5A-2649-00017', user: 'engineer', action: '', q: 'vout', from: '2026-12-01', to: '2026-12-02' });
    expect(page).toBe(3);
    expect(auditParamsFrom(filters, 3).toString()).toBe(params.toString());
    expect(auditParamsFrom(emptyAuditFilters).toString()).toBe('');
    expect(auditFiltersFromParams(new URLSearchParams('page=-2')).page).toBe(1);
  });

  it('asks the server for local days, the last one included', () => {
    const q = auditQueryFrom({ ...emptyAuditFilters, from: '2026-12-01', to: '2026-12-02' });
    expect(q.from).toBe(new Date(2026, 11, 1).toISOString());
    expect(q.to).toBe(new Date(2026, 11, 3).toISOString());
    expect(localDayStart('1.12.2026')).toBeUndefined();
  });

  it('explains a reversed or unreadable range', () => {
    expect(rangeProblem({ from: '2026-12-03', to: '2026-12-01' })).toBe('The first day is after the last day.');
    expect(rangeProblem({ from: 'soon', to: '' })).toBe('Enter the first day as a date.');
    expect(rangeProblem({ from: '2026-12-01', to: '2026-12-01' })).toBeNull();
  });
});

describe('audit record links', () => {
  it('opens each kind of object where it lives', () => {
    expect(auditLinkHref({ kind: 'unit', id: '4', label: 'K5A-2649-00017', serial: 'K5A-2649-00017' })).toBe('/units/K5A-2649-00017');
    expect(auditLinkHref({ kind: 'run', id: '812', label: 'Run #812' })).toBe('/runs/812');
    expect(auditLinkHref({ kind: 'plan_version', id: '9', label: 'EOL-BK3305 version 4', planId: 3 })).toBe('/plans?plan=3&version=9');
    expect(auditLinkHref({ kind: 'fixture', id: '2', label: 'FX-101' })).toBe('/fixtures?fixture=2');
    expect(auditLinkHref({ kind: 'lot', id: '5', label: 'LB-1' })).toBe('/lots?lot=5');
    expect(auditLinkHref({ kind: 'user', id: '5', label: 'engineer' })).toBe('/admin/users');
    expect(auditLinkHref({ kind: 'product', id: '1', label: 'OB-BK0503' })).toBeNull();
    expect(auditLinkHref(null)).toBeNull();
  });
});
