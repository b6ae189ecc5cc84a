import { describe, expect, it } from 'vitest';
import { AcceptLimitsDto, AnalysisQueryDto } from '../characterization/dto/characterization.dto';
import { plainToInstance } from 'class-transformer';
import { validateSync } from 'class-validator';
import { DEFAULT_SUGGESTION_K, SUGGESTION_K_MAX, SUGGESTION_K_MIN, suggestionKProblem, suggestionUncertaintyProblem } from './limit-suggestion';

/** The messages class-validator gives for one query/body, flattened. */
function messages(cls: typeof AnalysisQueryDto | typeof AcceptLimitsDto, plain: Record<string, unknown>): string[] {
  return validateSync(plainToInstance(cls, plain)).flatMap((e) => Object.values(e.constraints ?? {}));
}

describe('suggestion settings: the screen refuses what the API refuses, in its words', () => {
  it('accepts k from 0.5 to 10 inclusive and names the bound it breaks', () => {
    // self-constructed example: the bounds and their neighbours
    expect([SUGGESTION_K_MIN, DEFAULT_SUGGESTION_K, SUGGESTION_K_MAX].map(suggestionKProblem)).toEqual([null, null, null]);
    expect(suggestionKProblem(0.49)).toBe('k must be at least 0.5');
    expect(suggestionKProblem(10.01)).toBe('k must be at most 10');
    expect(suggestionKProblem(undefined)).toMatch(/k must be a number from 0.5 to 10/);
    expect(suggestionKProblem(Number.NaN)).toMatch(/k must be a number/);
  });

  it('accepts U of 0 or more', () => {
    expect(suggestionUncertaintyProblem(0)).toBeNull();
    expect(suggestionUncertaintyProblem(0.02)).toBeNull();
    expect(suggestionUncertaintyProblem(-0.001)).toBe('uncertainty must be 0 or more');
    expect(suggestionUncertaintyProblem(undefined)).toMatch(/must be a number/);
  });

  it('gives the same answer as the API\'s DTO checks on the same values', () => {
    for (const k of [0.2, 0.5, 4, 10, 12]) {
      const api = messages(AnalysisQueryDto, { column: 'vout_V', k: String(k) }).find((m) => m.startsWith('k ')) ?? null;
      expect(api).toBe(suggestionKProblem(k));
      const accept = messages(AcceptLimitsDto, { column: 'vout_V', planVersionId: 1, stepKey: 's', limitKey: 'l', low: 1, reason: 'why not', k }).find((m) => m.startsWith('k ')) ?? null;
      expect(accept).toBe(suggestionKProblem(k));
    }
    for (const u of [-1, 0, 0.5]) {
      const api = messages(AnalysisQueryDto, { column: 'vout_V', uncertainty: String(u) }).find((m) => m.startsWith('uncertainty')) ?? null;
      expect(api).toBe(suggestionUncertaintyProblem(u));
    }
  });
});
