import { readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { withStepKindTables } from './plan-docs';
import { buildPlanSchema } from './plan-schema';

/** The repository root, from src/plans or dist/plans alike. */
export const REPO_ROOT = resolve(__dirname, '..', '..', '..');
export const PLAN_SCHEMA_FILE = join(REPO_ROOT, 'test-plans', 'plan.schema.json');
export const PLAN_FORMAT_DOC = join(REPO_ROOT, 'docs', 'test-plan-format.md');

/** The schema file's text: the generated schema, 2-space JSON and a final newline. */
export function planSchemaText(): string {
  return `${JSON.stringify(buildPlanSchema(), null, 2)}\n`;
}

/** Writes the schema and the docs tables from the registry (scripts/gen-plan-schema.js). */
export function writePlanArtifacts(): string[] {
  writeFileSync(PLAN_SCHEMA_FILE, planSchemaText());
  writeFileSync(PLAN_FORMAT_DOC, withStepKindTables(readFileSync(PLAN_FORMAT_DOC, 'utf8')));
  return [PLAN_SCHEMA_FILE, PLAN_FORMAT_DOC];
}
