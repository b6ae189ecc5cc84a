import { Anchor, Alert, Button, Group, Paper, Skeleton, Stack, Text, Title } from '@mantine/core';
import { IconArrowLeft, IconFileTypePdf } from '@tabler/icons-react';
import { Link } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { pages } from '@/config/paths';
import { useRun } from '../api/get-run';
import { useOpenRepairTag } from '../hooks/use-open-repair-tag';
import { MeasurementsTable } from './measurements-table';
import classes from './run-detail.module.css';
import { RunVerdict } from './run-verdict';
import { Traceability } from './traceability';

function RepairTagButton({ runId }: { runId: number }) {
  const { state, open } = useOpenRepairTag(runId);
  return (
    <Stack gap={4} align="flex-end">
      <Button leftSection={<IconFileTypePdf size={18} aria-hidden />} loading={state.kind === 'loading'} onClick={() => void open()}>
        Repair tag (PDF)
      </Button>
      {state.kind === 'opened' && (
        <Anchor href={state.url} target="_blank" rel="noopener" size="sm">
          Open the tag again
        </Anchor>
      )}
      {state.kind === 'failed' && (
        <Text size="sm" c="signalRed.8" role="alert">
          {state.message}
        </Text>
      )}
    </Stack>
  );
}

/** One run as stored: who, with what and against which plan, then every measurement. */
export function RunDetailScreen({ runId }: { runId: number }) {
  const run = useRun(runId);
  const back = (
    <Anchor component={Link} to={pages.runs.href()} size="sm" mb="xs" display="inline-flex" style={{ alignItems: 'center', gap: 4 }}>
      <IconArrowLeft size={14} aria-hidden /> All runs
    </Anchor>
  );

  if (run.isPending) {
    return (
      <Stack gap="sm" aria-busy="true" aria-label="Loading the run">
        {back}
        <Skeleton height={48} width={420} />
        <Skeleton height={160} />
        <Skeleton height={240} />
      </Stack>
    );
  }
  if (run.isError) {
    return (
      <>
        {back}
        <ErrorNotice error={run.error} title="This run could not be loaded" onRetry={() => run.refetch()} />
      </>
    );
  }

  const r = run.data;
  const failures = r.measurements.filter((m) => m.verdict !== 'pass').length;
  return (
    <>
      {back}
      <Group justify="space-between" align="flex-start" mb="md" wrap="wrap" gap="md">
        <Stack gap={6}>
          <Group gap="md" align="center">
            <Title order={1} className={classes.serial} data-testid="run-serial">
              {r.serial}
            </Title>
            <RunVerdict verdict={r.verdict} size="lg" />
          </Group>
          <Text className={classes.context} data-testid="run-context">
            {r.partNumber} · lot {r.lotCode} · {r.stationCode} · run #{r.id}
          </Text>
        </Stack>
        {r.verdict === 'fail' && <RepairTagButton runId={r.id} />}
      </Group>

      <Traceability run={r} steps={r.steps} calibration={r.calibration ?? null} />

      <Paper withBorder radius="md" p="md" component="section" aria-labelledby="measurements-title">
        <Group justify="space-between" align="baseline" mb="sm">
          <Title order={2} fz="lg" id="measurements-title">
            Measurements
          </Title>
          <Text size="sm" c="dimmed">
            {r.measurements.length} stored{failures > 0 ? ` · ${failures} outside limits` : ''} · values as measured, never edited
          </Text>
        </Group>
        {r.verdict === 'running' && (
          <Alert color="graphite" variant="light" mb="sm">
            This unit is still being tested; the list fills in as values are stored.
          </Alert>
        )}
        <MeasurementsTable measurements={r.measurements} />
      </Paper>
    </>
  );
}
