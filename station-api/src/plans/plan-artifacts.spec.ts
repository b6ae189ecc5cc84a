import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { PLAN_FORMAT_DOC, PLAN_SCHEMA_FILE, planSchemaText } from './plan-artifacts';
import { DOCS_BEGIN, DOCS_END, withStepKindTables } from './plan-docs';

/*
 * The schema file and the docs tables are generated from the step-kind registry and checked in; these tests fail
 * when either drifts. Fix by running `npm run gen:plan-schema -w station-api`, never by editing the files.
 */
describe('generated plan artifacts', () => {
  it('test-plans/plan.schema.json is exactly what the registry generates', () => {
    expect(readFileSync(PLAN_SCHEMA_FILE, 'utf8'), 'stale test-plans/plan.schema.json: run npm run gen:plan-schema -w station-api').toBe(planSchemaText());
  });

  it('the step-kind tables of docs/test-plan-format.md are exactly what the registry generates', () => {
    const doc = readFileSync(PLAN_FORMAT_DOC, 'utf8');
    expect(doc).toContain(DOCS_BEGIN);
    expect(doc).toContain(DOCS_END);
    expect(doc, 'stale tables in docs/test-plan-format.md: run npm run gen:plan-schema -w station-api').toBe(withStepKindTables(doc));
  });
});
