import { PARAMS, boundsText } from './step-kinds/params';
import { ALL_STEP_KINDS } from './step-kinds/registry';
import type { ParamName } from './step-kinds/types';

/**
 * The step-kind and parameter tables of docs/test-plan-format.md, built from the registry. They sit between
 * marker comments; `npm run gen:plan-schema -w station-api` rewrites them and plan-artifacts.spec.ts fails when
 * the checked-in text drifts.
 */
export const DOCS_BEGIN = '<!-- generated:step-kinds begin (npm run gen:plan-schema -w station-api; do not edit by hand) -->';
export const DOCS_END = '<!-- generated:step-kinds end -->';

const code = (s: string) => `\`${s}\``;

export function buildStepKindTables(): string {
  const lines: string[] = [];
  lines.push('| kind | what it does | required params | optional params | limit keys (unit) | physical range of a reading |');
  lines.push('| --- | --- | --- | --- | --- | --- |');
  for (const def of ALL_STEP_KINDS) {
    const names = (need: string) =>
      Object.entries(def.params)
        .filter(([, n]) => n === need)
        .map(([p]) => code(p))
        .join(', ') || '–';
    const keys = def.quantities.map((q) => `${code(q.perLoad ? `${q.base}@<load>` : q.base)} (${q.unit === 'flag' ? 'flag: 1 = yes, 0 = no' : q.unit})`).join(', ');
    const ranges = def.quantities.map((q) => `${code(q.base)}: ${q.range.text}`).join('; ');
    lines.push(`| ${code(def.kind)} | ${def.summary} | ${names('required')} | ${names('optional')} | ${keys} | ${ranges} |`);
  }
  lines.push('');
  lines.push('| parameter | unit | bounds | meaning |');
  lines.push('| --- | --- | --- | --- |');
  for (const [name, def] of Object.entries(PARAMS) as [ParamName, (typeof PARAMS)[ParamName]][]) {
    lines.push(`| ${code(name)} | ${def.unit || '–'} | ${boundsText(def.schema) || '–'} | ${def.description} |`);
  }
  lines.push('');
  lines.push('What the fixture does in each kind (after `UUT:SER`):');
  lines.push('');
  for (const def of ALL_STEP_KINDS) lines.push(`- ${code(def.kind)}: ${def.sequence}.`);
  lines.push('');
  lines.push('Why each physical range holds:');
  lines.push('');
  for (const def of ALL_STEP_KINDS) {
    for (const q of def.quantities) lines.push(`- ${code(q.base)} (${code(def.kind)}): ${q.range.law}.`);
  }
  return lines.join('\n');
}

/** The docs text with the generated part between the markers replaced. */
export function withStepKindTables(doc: string): string {
  const begin = doc.indexOf(DOCS_BEGIN);
  const end = doc.indexOf(DOCS_END);
  if (begin < 0 || end < begin) throw new Error(`docs/test-plan-format.md lacks the markers ${DOCS_BEGIN} … ${DOCS_END}`);
  return `${doc.slice(0, begin + DOCS_BEGIN.length)}\n${buildStepKindTables()}\n${doc.slice(end)}`;
}
