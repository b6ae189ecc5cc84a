import { capability, mean, sampleStdDev, type ProportionInterval } from '../stats';
import { FLAG_UNIT } from '../contract/value-format';

/**
 * What a certificate of conformance states, as plain data: gathered from the database by
 * lot-certificate.service.ts, printed by certificate.pdf.ts. The summary statistics are computed here from
 * ../stats (mean, sample standard deviation, Cpk), so the arithmetic has one home.
 */
export interface CertificateContent {
  certificateNo: string;
  lot: { code: string; createdAt: Date; plannedQuantity: number };
  product: { partNumber: string; name: string };
  quantities: { registered: number; passed: number; scrapped: number };
  planVersions: { planCode: string; planName: string; version: number; checksum: string; runs: number }[];
  fixtures: { code: string; name: string; runs: number; calibrationDueAtTest: Date | null; calibrationDueNow: Date | null }[];
  yield: { unitsTested: number; firstPass: ProportionInterval; final: ProportionInterval; definitions: { firstPass: string; final: string; interval: string } };
  statistics: QuantitySummary[];
  /** what the statistics describe, in words */
  statisticsBasis: string;
  release: { by: string; at: Date; comment: string | null };
}

export interface QuantitySummary {
  stepName: string;
  name: string;
  quantity: string;
  unit: string;
  n: number;
  mean: number;
  /** sample standard deviation (n − 1); null for n < 2 */
  sd: number | null;
  min: number;
  max: number;
  lowLimit: number | null;
  highLimit: number | null;
  /** null where there is no limit or too little data (see cpkNote) */
  cpk: number | null;
  cpkNote: string | null;
}

/** One measured value of a shipped unit, in production order. */
export interface QuantityValue {
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  unit: string;
  value: number;
  lowLimit: number | null;
  highLimit: number | null;
}

/**
 * n, mean, σ, min, max and Cpk per quantity, in the order the quantities first appear. Yes/no results are left
 * out (a mean of 1/0 flags says nothing). Limits are the latest of the quantity's values; Cpk uses the
 * within-unit σ from the moving range of consecutive values (stats/capability.ts).
 */
export function summarizeQuantities(values: readonly QuantityValue[]): QuantitySummary[] {
  const groups = new Map<string, QuantityValue[]>();
  for (const v of values) {
    if (v.unit === FLAG_UNIT || !Number.isFinite(v.value)) continue;
    const key = `${v.stepKey}\u0000${v.quantity}`;
    const g = groups.get(key);
    if (g) g.push(v);
    else groups.set(key, [v]);
  }
  return [...groups.values()].map((g) => {
    const xs = g.map((v) => v.value);
    const last = g[g.length - 1];
    let cpk: number | null = null;
    let cpkNote: string | null = null;
    if (last.lowLimit === null && last.highLimit === null) cpkNote = 'no limit';
    else {
      try {
        cpk = capability(xs, { ...(last.lowLimit !== null ? { lsl: last.lowLimit } : {}), ...(last.highLimit !== null ? { usl: last.highLimit } : {}) }).cpk.value;
      } catch (e) {
        // too few values or no spread: the statistics refuse in words
        if (!(e instanceof RangeError)) throw e;
        cpkNote = xs.length < 2 ? 'too few values' : 'no spread';
      }
    }
    return {
      stepName: last.stepName,
      name: last.name,
      quantity: last.quantity,
      unit: last.unit,
      n: xs.length,
      mean: mean(xs),
      sd: xs.length >= 2 ? sampleStdDev(xs) : null,
      min: Math.min(...xs),
      max: Math.max(...xs),
      lowLimit: last.lowLimit,
      highLimit: last.highLimit,
      cpk,
      cpkNote,
    };
  });
}
