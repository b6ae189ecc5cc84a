import { ActionIcon, Alert, Badge, Button, Group, Paper, Select, Stack, Table, Text, TextInput, Tooltip } from '@mantine/core';
import { useDebouncedValue } from '@mantine/hooks';
import { IconArrowDown, IconArrowUp, IconPlus, IconTrash } from '@tabler/icons-react';
import { useQuery } from '@tanstack/react-query';
import { formatValue } from '@contract/value-format';
import { previewSteps, useStepKinds } from '../api/plans-api';
import type { LimitPreview, PlanStep, StepKindDescription, StepsPreview } from '../api/types';

interface DraftEditorProps {
  planId: number;
  steps: PlanStep[];
  /** null: read only (a version that is not a draft) */
  onChange: ((steps: PlanStep[]) => void) | null;
}

/** Problems the server reported for one field path, e.g. `steps[2].limits[0].high`. */
function problemsAt(preview: StepsPreview | undefined, field: string): string | undefined {
  const found = preview?.problems.filter((p) => p.field === field || p.field.startsWith(`${field}[`)).flatMap((p) => p.problems);
  return found && found.length > 0 ? found.join(' ') : undefined;
}

/** Text → what the server should check: a number when it reads as one, the text otherwise (the server names it). */
function parseScalar(text: string): unknown {
  const t = text.trim();
  if (t === '') return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : t;
}

function paramText(value: unknown): string {
  if (value === undefined || value === null) return '';
  if (Array.isArray(value)) return value.join(', ');
  return String(value);
}

function limitText(v: number | null | undefined, quantity: string, unit: string): string {
  if (v === null || v === undefined) return '−∞';
  const f = formatValue(v, quantity, unit);
  return `${f.text} ${f.unit}`.trim();
}

/**
 * Steps and limits of a draft as Mantine tables. The forms are built from the server's step-kind registry
 * (parameters with units, quantities with units), and every change is checked by the server (debounced): its
 * problems appear on their own fields, and the guarded limits follow from each stated uncertainty.
 */
export function DraftEditor({ planId, steps, onChange }: DraftEditorProps) {
  const kinds = useStepKinds();
  const [debounced] = useDebouncedValue(steps, 300);
  const preview = useQuery({
    queryKey: ['plan-preview', planId, debounced],
    queryFn: ({ signal }) => previewSteps(planId, debounced, signal),
    enabled: onChange !== null,
    placeholderData: (prev) => prev,
  });
  const readOnly = onChange === null;
  const kindOf = (k: string): StepKindDescription | undefined => kinds.data?.find((d) => d.kind === k);

  const update = (i: number, change: (s: PlanStep) => PlanStep) => onChange?.(steps.map((s, k) => (k === i ? change(structuredClone(s)) : s)));
  const move = (i: number, by: number) => {
    const next = [...steps];
    const [s] = next.splice(i, 1);
    next.splice(i + by, 0, s!);
    onChange?.(next);
  };
  const addStep = (kind: string) => {
    const def = kindOf(kind);
    const n = steps.length + 1;
    const limits = (def?.quantities ?? []).filter((q) => !q.perLoad).map((q) => ({ key: q.base, rule: 'simple' as const, uncertainty: 0 }));
    onChange?.([...steps, { key: `step-${n}`, name: `New ${kind.replace(/_/g, ' ')} step`, kind, params: {}, limits }]);
  };

  return (
    <Stack gap="md">
      {preview.data && !preview.data.valid && (
        <Alert color="red" title="The server found problems in this draft">
          {preview.data.problems.length} field(s) need attention; each problem is shown beside its field.
        </Alert>
      )}
      {steps.map((step, i) => {
        const def = kindOf(step.kind);
        const at = `steps[${i}]`;
        return (
          <Paper key={`${i}-${step.key}`} withBorder p="sm" aria-label={`Step ${i + 1}: ${step.name}`}>
            <Group justify="space-between" mb="xs" wrap="nowrap">
              <Group gap="xs">
                <Badge variant="light">{i + 1}</Badge>
                <TextInput aria-label={`Step ${i + 1} key`} value={step.key} readOnly={readOnly} w={170} error={problemsAt(preview.data, `${at}.key`)}
                  onChange={(e) => update(i, (s) => ({ ...s, key: e.currentTarget.value }))} />
                <TextInput aria-label={`Step ${i + 1} name`} value={step.name} readOnly={readOnly} w={380} error={problemsAt(preview.data, `${at}.name`)}
                  onChange={(e) => update(i, (s) => ({ ...s, name: e.currentTarget.value }))} />
                <Tooltip label={def?.summary ?? step.kind}>
                  <Badge color="gray" variant="outline">{step.kind}</Badge>
                </Tooltip>
              </Group>
              {!readOnly && (
                <Group gap={4}>
                  <ActionIcon variant="subtle" aria-label={`Move step ${i + 1} up`} disabled={i === 0} onClick={() => move(i, -1)}><IconArrowUp size={18} /></ActionIcon>
                  <ActionIcon variant="subtle" aria-label={`Move step ${i + 1} down`} disabled={i === steps.length - 1} onClick={() => move(i, 1)}><IconArrowDown size={18} /></ActionIcon>
                  <ActionIcon variant="subtle" color="red" aria-label={`Remove step ${i + 1}`} onClick={() => onChange?.(steps.filter((_, k) => k !== i))}><IconTrash size={18} /></ActionIcon>
                </Group>
              )}
            </Group>
            <Group gap="sm" mb="xs" align="flex-start">
              {(def?.params ?? []).map((p) => {
                const field = `${at}.params.${p.name}`;
                const label = `${p.name}${p.unit && p.unit !== 'points' ? ` (${p.unit})` : ''}${p.need === 'required' ? ' *' : ''}`;
                const value = step.params[p.name];
                if (Array.isArray(p.schema.enum)) {
                  return (
                    <Select key={p.name} label={label} w={170} data={p.schema.enum as string[]} value={(value as string) ?? null} readOnly={readOnly} clearable
                      error={problemsAt(preview.data, field)} description={p.description.slice(0, 40)}
                      onChange={(v) => update(i, (s) => ({ ...s, params: { ...s.params, [p.name]: v ?? undefined } }))} />
                  );
                }
                const isList = p.schema.type === 'array';
                return (
                  <TextInput key={p.name} label={label} w={isList ? 170 : 130} value={paramText(value)} readOnly={readOnly} error={problemsAt(preview.data, field)}
                    placeholder={isList ? 'e.g. 1.5, 3' : ''} classNames={{ input: 'figures' }}
                    onChange={(e) => {
                      const text = e.currentTarget.value;
                      const parsed = isList ? (text.trim() === '' ? undefined : text.split(',').map((x) => parseScalar(x)).filter((x) => x !== undefined)) : parseScalar(text);
                      update(i, (s) => ({ ...s, params: { ...s.params, [p.name]: parsed } }));
                    }} />
                );
              })}
            </Group>
            {problemsAt(preview.data, `${at}.params`) && !def?.params.some((p) => problemsAt(preview.data, `${at}.params.${p.name}`)) && (
              <Text c="red" size="sm">{problemsAt(preview.data, `${at}.params`)}</Text>
            )}
            <Table striped withTableBorder aria-label={`Limits of step ${i + 1}`} verticalSpacing={4}>
              <Table.Thead>
                <Table.Tr>
                  <Table.Th>Quantity</Table.Th>
                  <Table.Th>Unit</Table.Th>
                  <Table.Th>Low</Table.Th>
                  <Table.Th>High</Table.Th>
                  <Table.Th>Uncertainty U (k = 2)</Table.Th>
                  <Table.Th>Rule</Table.Th>
                  <Table.Th>Accepted (guarded)</Table.Th>
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {step.limits.map((l, j) => {
                  const lf = `${at}.limits[${j}]`;
                  const unit = l.unit ?? def?.quantities.find((q) => q.base === l.key.split('@')[0])?.unit ?? '';
                  const pv: LimitPreview | undefined = preview.data?.limits.find((x) => x.stepIndex === i && x.limitIndex === j);
                  const num = (name: 'low' | 'high' | 'uncertainty') => (
                    <TextInput aria-label={`${l.key} ${name}`} value={l[name] === undefined ? '' : String(l[name])} readOnly={readOnly} w={110}
                      error={problemsAt(preview.data, `${lf}.${name}`)} classNames={{ input: 'figures' }}
                      onChange={(e) => {
                        const v = parseScalar(e.currentTarget.value);
                        update(i, (s) => {
                          const limits = [...s.limits];
                          limits[j] = { ...limits[j]!, [name]: v } as typeof l;
                          return { ...s, limits };
                        });
                      }} />
                  );
                  return (
                    <Table.Tr key={`${j}-${l.key}`}>
                      <Table.Td>
                        <Text size="sm" ff="monospace">{l.key}</Text>
                        {problemsAt(preview.data, `${lf}.key`) && <Text c="red" size="xs">{problemsAt(preview.data, `${lf}.key`)}</Text>}
                      </Table.Td>
                      <Table.Td>{unit}</Table.Td>
                      <Table.Td>{num('low')}</Table.Td>
                      <Table.Td>{num('high')}</Table.Td>
                      <Table.Td>{num('uncertainty')}</Table.Td>
                      <Table.Td>
                        <Select aria-label={`${l.key} rule`} w={110} data={['simple', 'guarded']} value={l.rule ?? 'simple'} readOnly={readOnly} allowDeselect={false}
                          onChange={(v) => update(i, (s) => {
                            const limits = [...s.limits];
                            limits[j] = { ...limits[j]!, rule: (v ?? 'simple') as 'simple' | 'guarded' };
                            return { ...s, limits };
                          })} />
                      </Table.Td>
                      <Table.Td aria-label={`${l.key} accepted`}>
                        {pv?.problem ? <Text c="red" size="sm">no acceptance zone</Text> : pv ? <Text size="sm" ff="monospace">{pv.acceptLow === null ? '−∞' : limitText(pv.acceptLow, l.key, unit)} … {pv.acceptHigh === null ? '+∞' : limitText(pv.acceptHigh, l.key, unit)}</Text> : '—'}
                      </Table.Td>
                    </Table.Tr>
                  );
                })}
              </Table.Tbody>
            </Table>
          </Paper>
        );
      })}
      {!readOnly && (
        <Group>
          <Select aria-label="Kind of step to add" placeholder="Add a step of kind…" w={260} data={(kinds.data ?? []).map((k) => ({ value: k.kind, label: k.kind }))}
            value={null} onChange={(v) => v && addStep(v)} leftSection={<IconPlus size={16} />} />
          <Button variant="subtle" disabled>{steps.length} steps</Button>
        </Group>
      )}
    </Stack>
  );
}
