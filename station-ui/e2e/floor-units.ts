import { defectFor, type SimulatorConfig, type UnitCondition } from '@railwright/mock-fixture';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { demoUsers, type DemoRole } from './support/sign-in';

/**
 * Units of a station's active lot for the browser tests, chosen by what the simulated fixture will make of
 * them. The server is started with a FIXTURE_SIM_CONFIG file ({@link writeSimSettings}) that marks one
 * serial per station good and one `wrong_feedback` and gives no defect rates, so every other unit is good
 * too; `defectFor(serial, lot, config)` from mock-fixture, the simulator's own rule, confirms the choice.
 */
export interface StationUnits {
  stationId: number;
  stationCode: string;
  lotCode: string;
  /** Modelled as a good unit: passes (the first one is the serial the file marks good) */
  good: string[];
  /** Marked `wrong_feedback` by the file: its output voltage is off, so it fails a limit (not an error) */
  defective: string;
  defect: UnitCondition;
  /** Has the lot's serial form but is not registered */
  unknown: string;
}

/** The defect the settings file gives the chosen unit: a wrong set point shows as out-of-limit output voltage. */
export const FORCED_DEFECT: UnitCondition = 'wrong_feedback';

/** Serial prefix of the product each demo station tests (docs/architecture.md: EOL-1 OB-BK0503, ...). */
const DEMO_SERIAL_PREFIX: Record<string, string> = { 'EOL-1': 'K5A', 'EOL-2': 'K3E', 'EOL-3': 'KC2' };
/**
 * Sequences chosen in each station's active lot. A fresh demo seed registers the active lots as this week's
 * first lot of their product, numbered from 00001 (station-api DemoPlantSeeder); {@link unitsFor} checks it.
 */
const GOOD_SEQUENCE = 1;
const DEFECTIVE_SEQUENCE = 2;

/**
 * `YYWW` of a day as the seeder writes it into serials: ISO 8601 week-numbering year (last two digits) and
 * week; week 1 holds the year's first Thursday, weeks start on Monday. Local calendar day, as the seeder.
 */
export function isoYearWeek(date: Date): string {
  const day = Date.UTC(date.getFullYear(), date.getMonth(), date.getDate());
  const mondayBased = (new Date(day).getUTCDay() + 6) % 7;
  const thursday = new Date(day + (3 - mondayBased) * 86_400_000);
  const year = thursday.getUTCFullYear();
  const week = 1 + Math.floor((thursday.getTime() - Date.UTC(year, 0, 1)) / (7 * 86_400_000));
  return `${String(year % 100).padStart(2, '0')}${String(week).padStart(2, '0')}`;
}

export interface SimSettings {
  /** Pass to startStationServer */
  env: { FIXTURE_SIM_CONFIG: string };
  config: SimulatorConfig;
  /** Removes the temp folder holding the file */
  remove: () => Promise<void>;
}

/**
 * Writes a FIXTURE_SIM_CONFIG file into a temp folder for a server about to be started and seeded: for each
 * station, its active lot's unit 00001 good and 00002 `wrong_feedback`, nothing random. Written before the
 * seed, so the serials are those the seeder will make this week (and next week's too, should the seed run
 * across midnight into a new week).
 */
export async function writeSimSettings(stationCodes: string[]): Promise<SimSettings> {
  const now = Date.now();
  const weeks = new Set([isoYearWeek(new Date(now)), isoYearWeek(new Date(now + 15 * 60_000))]);
  const serials: Record<string, UnitCondition> = {};
  for (const code of stationCodes) {
    const prefix = DEMO_SERIAL_PREFIX[code];
    if (!prefix) throw new Error(`${code} is not a demo station (known: ${Object.keys(DEMO_SERIAL_PREFIX).join(', ')})`);
    for (const week of weeks) {
      serials[`${prefix}-${week}-${String(GOOD_SEQUENCE).padStart(5, '0')}`] = 'good';
      serials[`${prefix}-${week}-${String(DEFECTIVE_SEQUENCE).padStart(5, '0')}`] = FORCED_DEFECT;
    }
  }
  // no defectRates: a unit the file does not name is good
  const config: SimulatorConfig = { serials };
  const dir = await mkdtemp(join(tmpdir(), 'railwright-e2e-sim-'));
  const path = join(dir, 'fixture-sim.json');
  await writeFile(path, `${JSON.stringify(config, null, 2)}\n`);
  return { env: { FIXTURE_SIM_CONFIG: path }, config, remove: () => rm(dir, { recursive: true, force: true }) };
}

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

export async function unitsFor(baseUrl: string, token: string, stationCode: string, sim: SimSettings, goodCount = 1): Promise<StationUnits> {
  const stations = await api<{ id: number; code: string; activeLot: { id: number; code: string } | null }[]>(baseUrl, token, '/stations');
  const station = stations.find((s) => s.code === stationCode);
  if (!station?.activeLot) throw new Error(`${stationCode} has no active lot in the demo seed`);
  const lot = await api<{ code: string; firstSerial: string | null; lastSerial: string | null }>(baseUrl, token, `/lots/${station.activeLot.id}`);
  if (!lot.firstSerial || !lot.lastSerial) throw new Error(`lot ${lot.code} has no units`);
  const prefix = lot.firstSerial.slice(0, -5);
  const first = Number(lot.firstSerial.slice(-5));
  const last = Number(lot.lastSerial.slice(-5));
  const serials = Array.from({ length: last - first + 1 }, (_, i) => `${prefix}${String(first + i).padStart(5, '0')}`);
  const named = (condition: UnitCondition) => serials.filter((s) => sim.config.serials?.[s] === condition);
  const [forcedGood] = named('good');
  const [defective] = named(FORCED_DEFECT);
  if (!forcedGood || !defective) {
    throw new Error(
      `the simulator settings name no good and ${FORCED_DEFECT} unit of lot ${lot.code} (${lot.firstSerial} … ${lot.lastSerial}); ` +
        `they were written for ${Object.keys(sim.config.serials ?? {}).join(', ')}. Did the demo seed number its lots differently?`,
    );
  }
  // the simulator's own rule on the same settings: the chosen units are what the server will model
  const good = [forcedGood, ...serials.filter((s) => s !== forcedGood && defectFor(s, lot.code, sim.config) === 'good')].slice(0, goodCount);
  if (defectFor(forcedGood, lot.code, sim.config) !== 'good' || defectFor(defective, lot.code, sim.config) !== FORCED_DEFECT) {
    throw new Error(`mock-fixture does not read the settings as written for ${forcedGood} and ${defective}`);
  }
  return { stationId: station.id, stationCode, lotCode: lot.code, good, defective, defect: FORCED_DEFECT, unknown: `${prefix}99999` };
}
