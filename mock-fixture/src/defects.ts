import type { UnitModel } from './physics/model-types';
import { RandomStream, hashString, mulberry32 } from './physics/prng';
import { clampDamping } from './physics/unit-variation';

/** The faults the simulator can build into a unit. */
export const DEFECTS = [
  'wrong_feedback',
  'aged_output_cap',
  'weak_switch',
  'open_output',
  'no_protection',
  'intermittent_contact',
] as const;
export type DefectName = (typeof DEFECTS)[number];
/** A unit's condition: one defect or none. */
export type UnitCondition = DefectName | 'good';

/** Probability (0..1) of each defect; the rest of the population is good. */
export type DefectRates = Partial<Record<DefectName, number>>;

/**
 * Where defects go. Per-serial entries win, then the lot's rates (each defect named there replaces the
 * global rate for that defect), then the global rates.
 */
export interface SimulatorConfig {
  defectRates?: DefectRates;
  lots?: Record<string, { defectRates?: DefectRates }>;
  serials?: Record<string, UnitCondition>;
}

/**
 * Demo rates: about 3 % of units carry a defect, in proportions a module line might see
 * (invented for the demo; common practice, no source).
 */
export const DEMO_DEFECT_RATES: Readonly<Required<DefectRates>> = Object.freeze({
  wrong_feedback: 0.006,
  aged_output_cap: 0.007,
  weak_switch: 0.006,
  open_output: 0.003,
  no_protection: 0.003,
  intermittent_contact: 0.005,
});

/** The simulator's default configuration: demo defect rates everywhere, no per-lot or per-serial overrides. */
export const DEFAULT_SIMULATOR_CONFIG: Readonly<SimulatorConfig> = Object.freeze({ defectRates: DEMO_DEFECT_RATES });

/** A configuration with no defects at all, for runs that must see only good units. */
export const NO_DEFECTS_CONFIG: Readonly<SimulatorConfig> = Object.freeze({ defectRates: {} });

/** Thrown for a configuration that cannot be used; `problems` lists every fault found. */
export class SimulatorConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`invalid simulator configuration: ${problems.join('; ')}`);
    this.name = 'SimulatorConfigError';
  }
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function checkRates(rates: unknown, where: string, problems: string[]): void {
  if (rates === undefined) return;
  if (!isRecord(rates)) {
    problems.push(`${where} must be an object of defect → rate`);
    return;
  }
  let sum = 0;
  for (const [name, rate] of Object.entries(rates)) {
    if (!(DEFECTS as readonly string[]).includes(name)) {
      problems.push(`${where}.${name} is not a defect (known: ${DEFECTS.join(', ')})`);
    } else if (typeof rate !== 'number' || !Number.isFinite(rate) || rate < 0 || rate > 1) {
      problems.push(`${where}.${name} must be a number from 0 to 1, got ${JSON.stringify(rate)}`);
    } else {
      sum += rate;
    }
  }
  if (sum > 1 + 1e-12) problems.push(`${where} rates add up to ${sum}, more than 1`);
}

/**
 * Check a configuration read from a file or a caller and return it typed.
 * @throws SimulatorConfigError listing every problem, so the person editing the file can fix all at once
 */
export function validateSimulatorConfig(input: unknown): SimulatorConfig {
  const problems: string[] = [];
  if (!isRecord(input)) throw new SimulatorConfigError(['the configuration must be a JSON object']);
  for (const key of Object.keys(input)) {
    if (!['defectRates', 'lots', 'serials'].includes(key)) {
      problems.push(`unknown key "${key}" (allowed: defectRates, lots, serials)`);
    }
  }
  checkRates(input.defectRates, 'defectRates', problems);
  if (input.lots !== undefined) {
    if (!isRecord(input.lots)) problems.push('lots must be an object of lot code → {defectRates}');
    else {
      for (const [lot, entry] of Object.entries(input.lots)) {
        if (!isRecord(entry)) problems.push(`lots.${lot} must be an object {defectRates}`);
        else {
          for (const key of Object.keys(entry)) {
            if (key !== 'defectRates') problems.push(`lots.${lot}.${key} is not allowed (only defectRates)`);
          }
          checkRates(entry.defectRates, `lots.${lot}.defectRates`, problems);
          // a lot's rates replace the global ones per defect, so the merged set must also stay ≤ 1
          if (isRecord(entry.defectRates) && isRecord(input.defectRates) && problems.length === 0) {
            const merged = { ...input.defectRates, ...entry.defectRates } as Record<string, number>;
            const sum = Object.values(merged).reduce((a, b) => a + b, 0);
            if (sum > 1 + 1e-12) problems.push(`lots.${lot} merged with defectRates adds up to ${sum}, more than 1`);
          }
        }
      }
    }
  }
  if (input.serials !== undefined) {
    if (!isRecord(input.serials)) problems.push('serials must be an object of serial → defect or "good"');
    else {
      for (const [serial, condition] of Object.entries(input.serials)) {
        if (condition !== 'good' && !(DEFECTS as readonly unknown[]).includes(condition)) {
          problems.push(`serials.${serial} must be "good" or one of ${DEFECTS.join(', ')}, got ${JSON.stringify(condition)}`);
        }
      }
    }
  }
  if (problems.length > 0) throw new SimulatorConfigError(problems);
  return input as SimulatorConfig;
}

/**
 * The condition of a unit, deterministic from its serial: the same serial in the same lot under the same
 * configuration always gets the same answer.
 * @param serial the unit's serial
 * @param lotCode the lot the unit belongs to (selects per-lot rates)
 * @param config where defects go; defaults to {@link DEFAULT_SIMULATOR_CONFIG}
 */
export function defectFor(serial: string, lotCode: string, config: SimulatorConfig = DEFAULT_SIMULATOR_CONFIG): UnitCondition {
  const fixed = config.serials?.[serial];
  if (fixed) return fixed;
  const rates: DefectRates = { ...(config.defectRates ?? {}), ...(config.lots?.[lotCode]?.defectRates ?? {}) };
  // one uniform draw per serial, walked through the cumulative rates in the fixed DEFECTS order
  const u = mulberry32(hashString(`defect|${serial}`))();
  let cumulative = 0;
  for (const defect of DEFECTS) {
    cumulative += rates[defect] ?? 0;
    if (u < cumulative) return defect;
  }
  return 'good';
}

/**
 * Build a defect into a modelled unit. Sizes (modelling choices, no source):
 * - wrong_feedback: set point off by 6–10 %, either sign (a wrong divider resistor);
 * - aged_output_cap: ESR ×4, C ÷3; the loop crosses over higher and less damped (f_n ×√3, ζ ÷√3);
 * - weak_switch: high-side R_on ×4, rectifier worse (low-side R_on ×3, or diode drop ×2), switching
 *   loss ×2 (slow gate drive); efficiency falls 5–8 points at rated load and the case runs hot;
 * - open_output: output pins not connected;
 * - no_protection: no fold-back on overload;
 * - intermittent_contact: the unit is sound; the fixture's contact to it is not (handled by the simulator).
 * @returns a new unit; the input is not changed
 */
export function applyDefect(unit: UnitModel, condition: UnitCondition): UnitModel {
  const d = unit.design;
  const rng = new RandomStream(`defect-size|${unit.serial}`);
  switch (condition) {
    case 'good':
    case 'intermittent_contact':
      return unit;
    case 'wrong_feedback': {
      const sign = rng.uniform() < 0.5 ? -1 : 1;
      const offsetFraction = rng.between(0.06, 0.1);
      return { ...unit, setPointV: unit.ratings.voutV * (1 + sign * offsetFraction) };
    }
    case 'aged_output_cap':
      return {
        ...unit,
        design: {
          ...d,
          esrOhm: d.esrOhm * 4,
          capacitanceF: d.capacitanceF / 3,
          loopNaturalHz: d.loopNaturalHz * Math.sqrt(3),
          loopDamping: clampDamping(d.loopDamping / Math.sqrt(3)),
        },
      };
    case 'weak_switch':
      return {
        ...unit,
        design: {
          ...d,
          ronHighOhm: d.ronHighOhm * 4,
          rectifier:
            d.rectifier.kind === 'diode'
              ? { kind: 'diode', forwardDropV: d.rectifier.forwardDropV * 2 }
              : { kind: 'synchronous', ronLowOhm: d.rectifier.ronLowOhm * 3 },
          switchingLossS: d.switchingLossS * 2,
        },
      };
    case 'open_output':
      return { ...unit, outputOpen: true };
    case 'no_protection':
      return { ...unit, noProtection: true };
  }
}
