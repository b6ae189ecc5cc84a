/*
 * The characterization API's shapes as this screen reads them, typed by hand from station-api
 * src/characterization (characterization.service.ts, characterization-analysis.ts) until the lead regenerates
 * lib/api-types.ts.
 */

export interface DataSetColumn {
  /** header as written in the file, e.g. `vout_1.5A_V` */
  key: string;
  name: string;
  unit: string;
  /** units with a value */
  count: number;
}

export interface DataSetSummary {
  id: number;
  name: string;
  fileName: string;
  product: { id: number; partNumber: string; name: string } | null;
  uploadedBy: { id: number; username: string; displayName: string };
  uploadedAt: string;
  rowCount: number;
  columns: DataSetColumn[];
}

export interface IndexEstimate {
  value: number;
  lower: number;
  upper: number;
  confidence: number;
  method: string;
}

export interface PpmOutside {
  below: number;
  above: number;
  total: number;
}

export interface NormalityTest {
  test: 'Anderson–Darling' | 'Shapiro–Wilk';
  statistic: number;
  pValue: number;
  method: string;
}

export interface CapabilityReport {
  n: number;
  mean: number;
  sigmaWithin: number;
  sigmaOverall: number;
  cp: IndexEstimate | null;
  cpk: IndexEstimate;
  pp: IndexEstimate | null;
  ppk: IndexEstimate;
  ppmWithin: PpmOutside;
  ppmOverall: PpmOutside;
}

export interface LimitSuggestion {
  k: number;
  uncertainty: number;
  tolerance: { low?: number; high?: number };
  acceptance: { low?: number; high?: number };
  ppmOutsideTolerance: PpmOutside;
  ppmOutsideAcceptance: PpmOutside;
}

export interface Analysis {
  dataSet: DataSetSummary;
  column: DataSetColumn;
  n: number;
  missing: number;
  mean: number | null;
  sd: number | null;
  sigmaWithin: number | null;
  min: number | null;
  max: number | null;
  histogram: { edges: number[]; counts: number[]; binWidth: number; rule: 'freedman-diaconis' | 'sturges' } | null;
  normality: { andersonDarling: NormalityTest | null; shapiroWilk: NormalityTest | null; primary: NormalityTest | null; reading: string };
  limits: { low: number | null; high: number | null };
  capability: CapabilityReport | null;
  ppmOutside: PpmOutside | null;
  suggestion: LimitSuggestion | null;
  problems: string[];
}

/** One problem of a refused file, as the server lists it in `details.problems`. */
export interface FileProblem {
  line: number;
  column: string | null;
  message: string;
}

export interface AcceptRequest {
  column: string;
  planVersionId: number;
  stepKey: string;
  limitKey: string;
  low?: number;
  high?: number;
  /** the suggestion's k the engineer chose; recorded in the audit trail with the suggested and guarded limits */
  k?: number;
  /** the limit's expanded uncertainty U (k = 2); left out, the limit keeps its own */
  uncertainty?: number;
  /** the limit's decision rule; left out, the limit keeps its own */
  rule?: 'simple' | 'guarded';
  reason: string;
}

export interface LimitSpec {
  key: string;
  name?: string;
  unit?: string;
  low?: number;
  high?: number;
  uncertainty?: number;
  rule?: 'simple' | 'guarded';
}

export interface AcceptResult {
  planVersionId: number;
  planCode: string;
  version: number;
  stepKey: string;
  limitBefore: LimitSpec;
  limitAfter: LimitSpec;
  statistics: Record<string, unknown>;
  auditEventId: number;
}

/** Plans as the "Put into draft" form reads them (station-api src/plans/dto). */
export interface PlanChoice {
  id: number;
  code: string;
  name: string;
  product: { id: number; partNumber: string; name: string };
}

export interface PlanVersionChoice {
  id: number;
  version: number;
  stage: 'draft' | 'submitted' | 'released' | 'superseded' | 'retired';
}

export interface PlanWithVersions extends PlanChoice {
  versions: PlanVersionChoice[];
}

export interface VersionWithSteps extends PlanVersionChoice {
  plan: PlanChoice;
  steps: { key: string; name: string; kind: string; limits: LimitSpec[] }[];
}
