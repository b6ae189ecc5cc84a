import type { EntityManager } from '@mikro-orm/sqlite';
import type { PlanNames } from './audit-words';
import type { AuditLinkDto } from './dto/audit.dto';

/** Names of the objects a page of audit records points at, looked up in one query per object type. */
export interface AuditLabels {
  label(entityType: string, entityId: string | null): string | null;
  link(entityType: string, entityId: string | null, after: Record<string, unknown> | null): AuditLinkDto | null;
  planNames(entityId: string | null): PlanNames | null;
}

interface PlanVersionRow {
  id: number;
  version: number;
  plan_id: number;
  code: string;
  steps: string | null;
}

type Sql = (query: string, params: unknown[]) => Promise<Record<string, unknown>[]>;

const ids = (rows: { entityType: string; entityId: string | null }[], type: string): number[] => [
  ...new Set(rows.filter((r) => r.entityType === type && r.entityId !== null && /^\d+$/.test(r.entityId)).map((r) => Number(r.entityId))),
];

async function namesOf(sql: Sql, table: string, column: string, list: number[], idColumn = 'id'): Promise<Map<string, string>> {
  if (list.length === 0) return new Map();
  const rows = await sql(`select ${idColumn} as id, ${column} as name from ${table} where ${idColumn} in (${list.map(() => '?').join(', ')})`, list);
  return new Map(rows.map((r) => [String(r.id), String(r.name)]));
}

function planNamesFrom(stepsJson: string | null): PlanNames {
  const steps = new Map<string, { name: string; limits: Map<string, { name: string; unit: string }> }>();
  try {
    const parsed = JSON.parse(stepsJson ?? '[]') as { key: string; name: string; limits?: { key: string; name: string; unit: string }[] }[];
    for (const s of parsed) steps.set(s.key, { name: s.name, limits: new Map((s.limits ?? []).map((l) => [l.key, { name: l.name, unit: l.unit }])) });
  } catch {
    // a version whose steps cannot be read still gets its changes listed by key
  }
  return { steps };
}

/** Object types that map to a link kind the UI can open. */
const LINK_KIND: Readonly<Record<string, string>> = { test_run: 'run' };

export async function loadAuditLabels(em: EntityManager, rows: { entityType: string; entityId: string | null; action: string }[]): Promise<AuditLabels> {
  const sql: Sql = (q, p) => em.getConnection().execute(q, p);
  const [units, fixtures, users, lots, stations, products, runs] = await Promise.all([
    namesOf(sql, 'units', 'serial', ids(rows, 'unit')),
    namesOf(sql, 'fixtures', 'code', ids(rows, 'fixture')),
    namesOf(sql, 'users', 'username', ids(rows, 'user')),
    namesOf(sql, 'lots', 'code', ids(rows, 'lot')),
    namesOf(sql, 'stations', 'code', ids(rows, 'station')),
    namesOf(sql, 'products', 'part_number', ids(rows, 'product')),
    namesOf(sql, 'test_runs r join units un on un.id = r.unit_id', 'un.serial', ids(rows, 'test_run'), 'r.id'),
  ]);
  const pvIds = ids(rows, 'plan_version');
  // steps are read only for the edits, where limit names are needed
  const editedIds = new Set(ids(rows.filter((r) => r.action === 'plan_version.edited'), 'plan_version'));
  const planVersions = new Map<string, PlanVersionRow>();
  if (pvIds.length > 0) {
    const pv = (await sql(
      `select v.id, v.version, v.plan_id, p.code, case when v.id in (${[...editedIds, -1].join(', ')}) then v.steps else null end as steps ` +
        `from plan_versions v join test_plans p on p.id = v.plan_id where v.id in (${pvIds.map(() => '?').join(', ')})`,
      pvIds,
    )) as unknown as PlanVersionRow[];
    for (const r of pv) planVersions.set(String(r.id), r);
  }
  const byType: Record<string, Map<string, string>> = { unit: units, fixture: fixtures, user: users, lot: lots, station: stations, product: products };
  const plans = new Map<string, PlanNames>();

  const label = (type: string, id: string | null): string | null => {
    if (id === null) return null;
    if (type === 'plan_version') {
      const v = planVersions.get(id);
      return v ? `${v.code} version ${v.version}` : null;
    }
    if (type === 'test_run') return `#${id}`;
    return byType[type]?.get(id) ?? null;
  };

  return {
    label,
    planNames(id) {
      if (id === null) return null;
      const v = planVersions.get(id);
      if (!v || v.steps === null) return null;
      if (!plans.has(id)) plans.set(id, planNamesFrom(v.steps));
      return plans.get(id)!;
    },
    link(type, id, after) {
      if (id === null) return null;
      const kind = LINK_KIND[type] ?? type;
      if (type === 'unit') {
        const serial = units.get(id) ?? (typeof after?.serial === 'string' ? after.serial : undefined);
        return serial ? { kind, id, label: serial, serial } : null;
      }
      if (type === 'plan_version') {
        const v = planVersions.get(id);
        // a discarded draft is gone: nothing to open
        return v ? { kind, id, label: `${v.code} version ${v.version}`, planId: v.plan_id } : null;
      }
      if (type === 'test_run') {
        const serial = runs.get(id);
        return { kind, id, label: serial ? `Run #${id} (${serial})` : `Run #${id}` };
      }
      return { kind, id, label: label(type, id) ?? `#${id}` };
    },
  };
}
