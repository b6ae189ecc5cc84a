import { Alert, Anchor, Badge, Button, Checkbox, Group, NumberInput, Paper, Select, Stack, Table, Tabs, Text, Textarea, Title } from '@mantine/core';
import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { PageHeader } from '@/components/layout/page-header';
import { apiBase, apiPaths } from '@/config/paths';
import { useNewDraft, usePlan, usePlans, useRelease, useRetire, useSaveDraft, useSubmit, useVersion } from '../api/plans-api';
import type { PlanStep, VersionSummary, WhatIfResult } from '../api/types';
import { DraftEditor } from './draft-editor';
import { VersionComparison } from './version-comparison';
import { WhatIfPanel, WhatIfSummary } from './what-if-panel';

const stageColour: Record<string, string> = { draft: 'blue', submitted: 'orange', released: 'green', superseded: 'gray', retired: 'dark' };

function who(v: VersionSummary): string {
  return v.createdBy?.displayName ?? '—';
}

/** Engineering → Plans: plans per product, their versions, the draft editor, what-if, comparison and release. */
export function PlansScreen() {
  const [params, setParams] = useSearchParams();
  const plans = usePlans();
  const planId = Number(params.get('plan')) || plans.data?.[0]?.id || null;
  const versionId = Number(params.get('version')) || null;
  const plan = usePlan(planId);
  const selectedId = versionId ?? plan.data?.versions[0]?.id ?? null;
  const version = useVersion(selectedId);
  const released = plan.data?.releasedVersion ?? null;

  const [steps, setSteps] = useState<PlanStep[]>([]);
  const [stop, setStop] = useState(false);
  const [attempts, setAttempts] = useState<number | string>(3);
  const [dirty, setDirty] = useState(false);
  const [whatIf, setWhatIf] = useState<WhatIfResult | null>(null);
  const [reason, setReason] = useState('');
  const [compareFrom, setCompareFrom] = useState<string | null>(null);
  useEffect(() => {
    if (!version.data) return;
    setSteps(version.data.steps);
    setStop(version.data.stopAtFirstFailure);
    setAttempts(version.data.maxAttempts);
    setDirty(false);
  }, [version.data]);
  useEffect(() => {
    setWhatIf(null);
    setReason('');
  }, [selectedId]);

  const save = useSaveDraft();
  const newDraft = useNewDraft();
  const submit = useSubmit();
  const release = useRelease();
  const retire = useRetire();
  const failure = [save, newDraft, submit, release, retire].find((m) => m.isError)?.error;

  const choose = (p: number | null, v: number | null) => {
    const next = new URLSearchParams();
    if (p) next.set('plan', String(p));
    if (v) next.set('version', String(v));
    setParams(next);
  };
  const v = version.data;
  const isDraft = v?.state === 'draft';
  const isOpenDraft = isDraft && v.stage === 'draft';
  const baseline = released && v && released.id !== v.id ? released.id : null;

  return (
    <>
      <PageHeader title="Test plans" description="Plans per product under revision control: draft, submit, a second engineer releases." />
      <Group align="flex-start" wrap="nowrap" gap="lg">
        <Stack w={420} gap="sm">
          <Select label="Plan" data={(plans.data ?? []).map((p) => ({ value: String(p.id), label: `${p.code} · ${p.product.partNumber}` }))} value={planId ? String(planId) : null}
            onChange={(x) => choose(Number(x), null)} allowDeselect={false} />
          <Table aria-label="Versions" highlightOnHover withTableBorder>
            <Table.Thead><Table.Tr><Table.Th>Version</Table.Th><Table.Th>Stage</Table.Th><Table.Th>By</Table.Th><Table.Th>Checksum</Table.Th></Table.Tr></Table.Thead>
            <Table.Tbody>
              {(plan.data?.versions ?? []).map((x) => (
                <Table.Tr key={x.id} onClick={() => choose(planId, x.id)} style={{ cursor: 'pointer' }} bg={x.id === selectedId ? 'var(--mantine-color-gray-1)' : undefined}>
                  <Table.Td>v{x.version}</Table.Td>
                  <Table.Td><Badge color={stageColour[x.stage]} variant="light">{x.stage}</Badge></Table.Td>
                  <Table.Td>{who(x)}</Table.Td>
                  <Table.Td ff="monospace">{x.checksum.slice(0, 10)}</Table.Td>
                </Table.Tr>
              ))}
            </Table.Tbody>
          </Table>
        </Stack>
        {v && (
          <Stack style={{ flex: 1, minWidth: 0 }} gap="md">
            <Group justify="space-between">
              <div>
                <Title order={2}>{v.plan.code} version {v.version} <Badge color={stageColour[v.stage]}>{v.stage}</Badge></Title>
                <Text size="sm" c="dimmed">{v.reason} · created by {who(v)} · checksum <span className="figures">{v.checksum.slice(0, 16)}</span></Text>
              </div>
              <Group>
                <Anchor href={`${apiBase}${apiPaths.planVersionExport(v.id)}`} onClick={(e) => { e.preventDefault(); void downloadExport(v.id); }}>Export as plan file</Anchor>
                <Button variant="light" loading={newDraft.isPending} onClick={() => newDraft.mutate({ fromId: v.id, reason: `New draft from version ${v.version}` }, { onSuccess: (d) => choose(planId, d.id) })}>
                  New draft from this version
                </Button>
                {(v.state !== 'draft') && !v.retiredAt && (
                  <Button variant="subtle" color="gray" onClick={() => retire.mutate({ id: v.id, reason: reason || 'Retired from the plans page' })}>Retire</Button>
                )}
              </Group>
            </Group>
            {failure && <Alert color="red" title="Refused">{failure.message}</Alert>}
            <Tabs defaultValue="steps" keepMounted={false}>
              <Tabs.List>
                <Tabs.Tab value="steps">Steps and limits</Tabs.Tab>
                <Tabs.Tab value="compare">Compare</Tabs.Tab>
              </Tabs.List>
              <Tabs.Panel value="steps" pt="md">
                <Group mb="sm">
                  <Checkbox label="Stop at the first failed step" checked={stop} disabled={!isDraft} onChange={(e) => { setStop(e.currentTarget.checked); setDirty(true); }} />
                  <NumberInput label="Attempts per unit" w={150} min={1} max={10} value={attempts} disabled={!isDraft} onChange={(x) => { setAttempts(x); setDirty(true); }} />
                  {isDraft && (
                    <Button mt="lg" disabled={!dirty} loading={save.isPending}
                      onClick={() => save.mutate({ id: v.id, steps, stopAtFirstFailure: stop, maxAttempts: Number(attempts) })}>Save draft</Button>
                  )}
                  {isDraft && dirty && <Text mt="lg" size="sm" c="orange">Unsaved changes</Text>}
                </Group>
                <DraftEditor planId={v.plan.id} steps={steps} onChange={isDraft ? (s) => { setSteps(s); setDirty(true); } : null} />
              </Tabs.Panel>
              <Tabs.Panel value="compare" pt="md">
                <Select label="Compare this version with" w={300} data={(plan.data?.versions ?? []).filter((x) => x.id !== v.id).map((x) => ({ value: String(x.id), label: `v${x.version} (${x.stage})` }))}
                  value={compareFrom} onChange={setCompareFrom} mb="sm" />
                <VersionComparison fromId={compareFrom ? Number(compareFrom) : null} toId={compareFrom ? v.id : null} />
              </Tabs.Panel>
            </Tabs>
            {isDraft && <WhatIfPanel versionId={v.id} result={whatIf} onResult={setWhatIf} />}
            {isOpenDraft && (
              <Paper withBorder p="md" aria-label="Submit for release">
                <Title order={3} mb="xs">Submit for release</Title>
                <Textarea label="What changed and why" value={reason} onChange={(e) => setReason(e.currentTarget.value)} minRows={2} />
                <Button mt="sm" disabled={dirty || reason.trim().length < 3} loading={submit.isPending} onClick={() => submit.mutate({ id: v.id, reason })}>Submit for release</Button>
                {dirty && <Text size="sm" c="dimmed">Save the draft first.</Text>}
              </Paper>
            )}
            {isDraft && v.stage === 'submitted' && (
              <Paper withBorder p="md" aria-label="Release form">
                <Title order={3} mb="xs">Release version {v.version}</Title>
                <Text size="sm" mb="sm">Submitted by {v.submittedBy?.displayName ?? '—'}: “{v.changeReason}”. Someone who did not write or edit this draft releases it.</Text>
                <Title order={4}>Changes against the released version</Title>
                <VersionComparison fromId={baseline} toId={baseline ? v.id : null} />
                <Title order={4} mt="md">What-if</Title>
                {whatIf ? <WhatIfSummary r={whatIf} /> : <Text size="sm" c="dimmed">Run the what-if above to see its summary here.</Text>}
                <Textarea mt="md" label="Why it is released now" value={reason} onChange={(e) => setReason(e.currentTarget.value)} minRows={2} />
                <Button mt="sm" color="green" disabled={reason.trim().length < 3} loading={release.isPending} onClick={() => release.mutate({ id: v.id, reason })}>Release</Button>
              </Paper>
            )}
          </Stack>
        )}
      </Group>
    </>
  );
}

/** Downloads the export with the bearer token (a plain link would carry none). */
async function downloadExport(id: number): Promise<void> {
  const { tokenStore } = await import('@/lib/api-client');
  const res = await fetch(`${apiBase}${apiPaths.planVersionExport(id)}`, { headers: { Authorization: `Bearer ${tokenStore.get() ?? ''}` } });
  const blob = await res.blob();
  const name = /filename="([^"]+)"/.exec(res.headers.get('content-disposition') ?? '')?.[1] ?? 'plan.yaml';
  const a = document.createElement('a');
  a.href = URL.createObjectURL(blob);
  a.download = name;
  a.click();
  URL.revokeObjectURL(a.href);
}
