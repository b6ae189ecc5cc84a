import { defectFor, type UnitCondition } from '@railwright/mock-fixture';
import { demoUsers, type DemoRole } from './support/sign-in';

/**
 * Units of a station's active lot for the browser tests, chosen by what the simulated fixture will make of
 * them. The server's simulators use the simulator's default configuration (demo defect rates placed by a
 * hash of the serial; station-api/src/fixtures/transport/simulated-fixtures.ts), so `defectFor(serial,
 * lot)` from mock-fixture says in advance which units it models as defective. No setting exists yet to
 * mark a chosen serial defective on a running server.
 */
export interface StationUnits {
  stationId: number;
  stationCode: string;
  lotCode: string;
  /** Modelled as a good unit: passes */
  good: string[];
  /** Modelled with a defect that fails a limit (not an error) */
  defective: string;
  defect: UnitCondition;
  /** Has the lot's serial form but is not registered */
  unknown: string;
}

/** Defects whose unit fails a limit, plainest first: a wrong set point shows as out-of-limit output voltage. */
export const FAILING_DEFECTS: UnitCondition[] = ['wrong_feedback', 'open_output', 'weak_switch', 'aged_output_cap'];

export async function apiToken(baseUrl: string, role: DemoRole): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify(demoUsers[role]),
  });
  if (!res.ok) throw new Error(`sign-in as ${role} answered ${res.status}: ${await res.text()}`);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

export async function api<T>(baseUrl: string, token: string, path: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  const res = await fetch(`${baseUrl}/api${path}`, {
    method: init.method ?? 'GET',
    headers: { Authorization: `Bearer ${token}`, ...(init.body !== undefined ? { 'Content-Type': 'application/json' } : {}) },
    body: init.body !== undefined ? JSON.stringify(init.body) : undefined,
  });
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${path} answered ${res.status}: ${await res.text()}`);
  return (await res.json()) as T;
}

export async function unitsFor(baseUrl: string, token: string, stationCode: string, goodCount = 1): Promise<StationUnits> {
  const stations = await api<{ id: number; code: string; activeLot: { id: number; code: string } | null }[]>(baseUrl, token, '/stations');
  const station = stations.find((s) => s.code === stationCode);
  if (!station?.activeLot) throw new Error(`${stationCode} has no active lot in the demo seed`);
  const lot = await api<{ code: string; firstSerial: string | null; lastSerial: string | null }>(baseUrl, token, `/lots/${station.activeLot.id}`);
  if (!lot.firstSerial || !lot.lastSerial) throw new Error(`lot ${lot.code} has no units`);
  const prefix = lot.firstSerial.slice(0, -5);
  const first = Number(lot.firstSerial.slice(-5));
  const last = Number(lot.lastSerial.slice(-5));
  const serials = Array.from({ length: last - first + 1 }, (_, i) => `${prefix}${String(first + i).padStart(5, '0')}`);
  const good = serials.filter((s) => defectFor(s, lot.code) === 'good').slice(0, goodCount);
  let defective: string | undefined;
  let defect: UnitCondition = 'good';
  for (const wanted of FAILING_DEFECTS) {
    defective = serials.find((s) => defectFor(s, lot.code) === wanted);
    if (defective) {
      defect = wanted;
      break;
    }
  }
  if (good.length < goodCount || !defective) throw new Error(`lot ${lot.code} (${lot.firstSerial} … ${lot.lastSerial}) lacks good or failing units`);
  return { stationId: station.id, stationCode, lotCode: lot.code, good, defective, defect, unknown: `${prefix}99999` };
}
