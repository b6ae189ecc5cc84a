import { Alert, Anchor, Button, Group, Modal, Select, Stack, Text, Textarea } from '@mantine/core';
import { IconCheck } from '@tabler/icons-react';
import { formatLimits } from '@contract/value-format';
import { useEffect, useState } from 'react';
import { Link } from 'react-router-dom';
import { pages } from '@/config/paths';
import { useAccept, usePlanChoices, usePlanVersions, useVersionSteps } from '../api/characterization-api';
import type { DataSetColumn, DataSetSummary, LimitSpec } from '../api/types';
import { indexText, ppmText } from './characterization-format';

interface PutIntoDraftProps {
  dataSet: DataSetSummary;
  column: DataSetColumn;
  low: number | undefined;
  high: number | undefined;
  /** figures shown in the confirmation, as the screen computed them for these limits */
  summary: { n: number; ppk: number | null; ppm: number | null };
  /** the suggestion's k and U as the engineer set them; null while a field holds a refused value */
  settings: { k: number; uncertainty: number } | null;
}

/**
 * What "Put into draft" sends besides the limits: always the k the engineer chose (the audit trail records it with
 * the suggestion); a U above 0 becomes the limit's uncertainty with the guarded rule, so the station guards the new
 * limits exactly as the screen drew them. U = 0 leaves the limit's own uncertainty and rule as they are.
 */
export function acceptSettings(settings: { k: number; uncertainty: number }): { k: number; uncertainty?: number; rule?: 'guarded' } {
  return settings.uncertainty > 0 ? { k: settings.k, uncertainty: settings.uncertainty, rule: 'guarded' } : { k: settings.k };
}

/** Chooses a limit of a draft plan version and puts the proposed low/high into it, after a confirmation. */
export function PutIntoDraft({ dataSet, column, low, high, summary, settings }: PutIntoDraftProps) {
  const plans = usePlanChoices();
  const [planId, setPlanId] = useState<number | null>(null);
  const [versionId, setVersionId] = useState<number | null>(null);
  const [target, setTarget] = useState<string | null>(null);
  const [reason, setReason] = useState('');
  const [confirming, setConfirming] = useState(false);
  const plan = usePlanVersions(planId);
  const version = useVersionSteps(versionId);
  const accept = useAccept();

  // start with the plan of the data set's product
  useEffect(() => {
    if (planId === null && dataSet.product && plans.data) {
      const match = plans.data.find((p) => p.product.partNumber === dataSet.product!.partNumber);
      if (match) setPlanId(match.id);
    }
  }, [planId, dataSet.product, plans.data]);

  const drafts = (plan.data?.versions ?? []).filter((v) => v.stage === 'draft' || v.stage === 'submitted');
  useEffect(() => {
    if (versionId === null && drafts.length === 1) setVersionId(drafts[0]!.id);
  }, [versionId, drafts]);

  // only limits in the column's unit: a V column cannot set a mV limit
  const limitGroups = (version.data?.steps ?? [])
    .map((s) => ({ group: s.name, items: s.limits.filter((l) => l.unit === column.unit).map((l) => ({ value: `${s.key}/${l.key}`, label: `${l.key} · now ${formatLimits(l.low, l.high, l.key, l.unit ?? '')}` })) }))
    .filter((g) => g.items.length > 0);
  const [stepKey, limitKey] = target ? (target.split('/') as [string, string]) : [null, null];
  const current: LimitSpec | undefined = version.data?.steps.find((s) => s.key === stepKey)?.limits.find((l) => l.key === limitKey);
  const proposed = formatLimits(low, high, column.name, column.unit);
  const blocked =
    low === undefined && high === undefined
      ? 'Propose a low limit, a high limit or both first.'
      : settings === null
        ? 'Correct k or U above first.'
        : !current
        ? 'Choose a plan, a draft version and a limit.'
        : reason.trim().length < 3
          ? 'Say why, in the reason field.'
          : null;

  const send = () =>
    accept.mutate(
      {
        dataSetId: dataSet.id,
        body: { column: column.key, planVersionId: versionId!, stepKey: stepKey!, limitKey: limitKey!, low, high, ...acceptSettings(settings!), reason: reason.trim() },
      },
      { onSuccess: () => setConfirming(false) },
    );

  return (
    <Stack gap="sm">
      <Group grow align="flex-start" wrap="wrap">
        <Select
          label="Plan"
          placeholder="Choose a plan"
          data={(plans.data ?? []).map((p) => ({ value: String(p.id), label: `${p.code} — ${p.product.partNumber}` }))}
          value={planId === null ? null : String(planId)}
          onChange={(v) => {
            setPlanId(v === null ? null : Number(v));
            setVersionId(null);
            setTarget(null);
            accept.reset();
          }}
        />
        <Select
          label="Draft version"
          placeholder={planId === null ? 'Choose a plan first' : drafts.length === 0 ? 'No draft' : 'Choose a draft'}
          data={drafts.map((v) => ({ value: String(v.id), label: `v${v.version} — ${v.stage === 'submitted' ? 'submitted (an edit withdraws it)' : 'draft'}` }))}
          value={versionId === null ? null : String(versionId)}
          onChange={(v) => {
            setVersionId(v === null ? null : Number(v));
            setTarget(null);
            accept.reset();
          }}
          disabled={planId === null || drafts.length === 0}
        />
      </Group>
      {planId !== null && plan.isSuccess && drafts.length === 0 && (
        <Text size="sm" c="dimmed">
          This plan has no draft; released versions never change. Start a draft on the{' '}
          <Anchor component={Link} to={pages.plans.href()}>
            Plans
          </Anchor>{' '}
          page, then come back.
        </Text>
      )}
      <Select
        label="Limit"
        description={`Limits in ${column.unit}, the unit of ${column.key}`}
        placeholder={versionId === null ? 'Choose a draft version first' : limitGroups.length === 0 ? `No limit in ${column.unit} in this version` : 'Choose a limit'}
        data={limitGroups}
        value={target}
        onChange={(v) => {
          setTarget(v);
          accept.reset();
        }}
        disabled={versionId === null || limitGroups.length === 0}
        searchable
      />
      <Textarea label="Reason" placeholder="e.g. Pilot build P2, 60 units: Ppk above 1.33 with these limits" value={reason} onChange={(e) => setReason(e.currentTarget.value)} rows={2} />
      <Group>
        <Button onClick={() => setConfirming(true)} disabled={blocked !== null}>
          Put into draft…
        </Button>
        {blocked && (
          <Text size="sm" c="dimmed">
            {blocked}
          </Text>
        )}
      </Group>
      {accept.isError && !confirming && (
        <Alert color="signalRed" variant="light" title="The limit was not changed" role="alert">
          {accept.error.message}
        </Alert>
      )}
      {accept.isSuccess && (
        <Alert color="signalGreen" variant="light" icon={<IconCheck aria-hidden />} title="Limit put into the draft" role="status">
          {accept.data.limitAfter.key} of {accept.data.planCode} v{accept.data.version} is now{' '}
          <Text span ff="monospace">
            {formatLimits(accept.data.limitAfter.low, accept.data.limitAfter.high, column.name, column.unit)}
          </Text>
          . The audit trail records data set “{dataSet.name}” (n = {summary.n}) and its figures. Review and submit the draft on the{' '}
          <Anchor component={Link} to={pages.plans.href()}>
            Plans
          </Anchor>{' '}
          page.
        </Alert>
      )}
      <Modal opened={confirming} onClose={() => setConfirming(false)} title="Put these limits into the draft?" centered size="lg">
        {current && (
          <Stack gap="xs">
            <Text size="sm">
              {version.data?.plan.code} version {version.data?.version}, step {stepKey}, limit <b>{limitKey}</b>
            </Text>
            <Text size="sm">
              Now{' '}
              <Text span ff="monospace">
                {formatLimits(current.low, current.high, column.name, column.unit)}
              </Text>{' '}
              → new{' '}
              <Text span ff="monospace" fw={700}>
                {proposed}
              </Text>
              {(low === undefined) !== (current.low === undefined) || (high === undefined) !== (current.high === undefined) ? ' (a bound left empty is removed)' : ''}
            </Text>
            <Text size="sm" c="dimmed">
              From “{dataSet.name}”, {column.key}: n = {summary.n}
              {summary.ppk !== null && `, Ppk ${indexText(summary.ppk)}`}
              {summary.ppm !== null && `, expected ${ppmText(summary.ppm)} ppm outside`}
              ; suggestion k = {settings?.k}.
            </Text>
            <Text size="sm" data-testid="accept-guard">
              {settings && settings.uncertainty > 0 ? (
                <>
                  Uncertainty U becomes ± {Number(settings.uncertainty.toPrecision(6))} {column.unit} with the guarded rule: the station accepts{' '}
                  <Text span ff="monospace">
                    {formatLimits(low === undefined ? undefined : low + settings.uncertainty, high === undefined ? undefined : high - settings.uncertainty, column.name, column.unit)}
                  </Text>
                  .
                </>
              ) : (
                'U = 0: the limit keeps its own uncertainty and decision rule.'
              )}
            </Text>
            <Text size="sm">Reason: {reason.trim()}</Text>
            {accept.isError && (
              <Alert color="signalRed" variant="light" role="alert">
                {accept.error.message}
              </Alert>
            )}
            <Group justify="flex-end" mt="sm">
              <Button variant="default" onClick={() => setConfirming(false)}>
                Cancel
              </Button>
              <Button onClick={send} loading={accept.isPending}>
                Put into draft
              </Button>
            </Group>
          </Stack>
        )}
      </Modal>
    </Stack>
  );
}
