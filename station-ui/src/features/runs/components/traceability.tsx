import { Alert, Paper, SimpleGrid, Title } from '@mantine/core';
import { IconAlertTriangle } from '@tabler/icons-react';
import { endReasonWords } from '@contract/run-outcome';
import type { RunCalibration, RunRow as RunView } from '../api/run-types';
import { formatDay, formatDuration, formatStamp } from '../format';
import { CalibrationUsed } from './calibration-used';
import classes from './run-detail.module.css';
import { Field, FieldGroup, missing } from './trace-fields';

/** True when the fixture's calibration had already run out when the run started. */
export function calibrationLapsed(run: Pick<RunView, 'startedAt' | 'fixtureCalibrationDueAt'>): boolean {
  if (!run.fixtureCalibrationDueAt) return false;
  return new Date(run.fixtureCalibrationDueAt).getTime() < new Date(run.startedAt).getTime();
}

/**
 * What the run was made with and by whom, as stored with the run (not as the plan or fixture stand today),
 * so a quality question about one unit is answered from this block alone.
 */
export function Traceability({
  run,
  steps = [],
  calibration,
}: {
  run: RunView;
  steps?: { key: string; name: string }[];
  /** the calibration record the run was judged with; null: none kept; left out: not known to this view */
  calibration?: RunCalibration | null;
}) {
  // the failed step as the plan names it (issue 12); the key only when the plan does not know it
  const failedStepName = run.failedStepName ?? steps.find((s) => s.key === run.failedStepKey)?.name ?? null;
  const endReason = endReasonWords(run.endReason);
  return (
    <Paper withBorder radius="md" p="md" mb="lg" component="section" aria-labelledby="trace-title">
      <Title order={2} fz="lg" mb="sm" id="trace-title">
        Traceability
      </Title>
      <SimpleGrid cols={{ base: 1, sm: 2, lg: 4 }} spacing="lg">
        <FieldGroup title="Test plan">
          <Field label="Plan" mono testId="trace-plan">
            {run.planCode} v{run.planVersion}
          </Field>
          <Field label="Plan version id" mono>
            {run.planVersionId}
          </Field>
        </FieldGroup>
        <FieldGroup title="Fixture at the time">
          <Field label="Fixture" mono testId="trace-fixture">
            {run.fixtureCode}
          </Field>
          <Field label="Identity reported" mono testId="trace-fixture-identity">
            {run.fixtureIdentity ?? missing}
          </Field>
          <Field label="Calibration due" mono testId="trace-calibration">
            {run.fixtureCalibrationDueAt ? formatDay(run.fixtureCalibrationDueAt) : missing}
            {calibrationLapsed(run) && <span className={classes.warn}> (overdue when tested)</span>}
          </Field>
          <Field label="Contact cycles" mono testId="trace-cycles">
            {run.fixtureContactCycles ?? missing}
          </Field>
        </FieldGroup>
        <FieldGroup title="Who and when">
          <Field label="Operator" testId="trace-operator">
            {run.operatorName}
          </Field>
          <Field label="Started" mono testId="trace-started">
            {formatStamp(run.startedAt)}
          </Field>
          <Field label="Finished" mono testId="trace-finished">
            {run.finishedAt ? formatStamp(run.finishedAt) : <span className={classes.dim}>still testing</span>}
          </Field>
          <Field label="Duration" mono>
            {formatDuration(run.durationMs)}
          </Field>
        </FieldGroup>
        <FieldGroup title="This unit">
          <Field label="Attempt" mono testId="trace-attempt">
            {run.attempt}
            {run.attempt > 1 && <span className={classes.dim}> (retest)</span>}
          </Field>
          <Field label="Failed step">
            {run.failedStepKey ? (
              <span title={run.failedStepKey}>{failedStepName ?? run.failedStepKey}</span>
            ) : (
              <span className={classes.dim}>none</span>
            )}
          </Field>
          <Field label="Retest override" testId="trace-override">
            {run.overrideReason ? (
              <>
                “{run.overrideReason}”{run.overrideByName && <span className={classes.dim}> — {run.overrideByName}</span>}
              </>
            ) : (
              <span className={classes.dim}>none</span>
            )}
          </Field>
        </FieldGroup>
      </SimpleGrid>
      {calibration !== undefined && <CalibrationUsed calibration={calibration} fixtureCode={run.fixtureCode} fixtureId={run.fixtureId} />}
      {(run.errorMessage || endReason) && (
        <Alert
          mt="md"
          color="signalAmber"
          variant="light"
          title={endReason ? `Run ended: ${endReason}` : 'Error recorded with the run'}
          icon={<IconAlertTriangle aria-hidden />}
          data-testid="trace-error"
        >
          {run.errorMessage}
        </Alert>
      )}
    </Paper>
  );
}
