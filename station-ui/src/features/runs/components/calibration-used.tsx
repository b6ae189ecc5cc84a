import { Anchor, Button, Group, Table, Text } from '@mantine/core';
import { IconDownload } from '@tabler/icons-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { pages } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { canOpen, useUser } from '@/lib/auth';
import { getCalibrationCertificate } from '../api/get-calibration-certificate';
import type { RunCalibration } from '../api/run-types';
import { formatDay, formatStamp } from '../format';
import classes from './run-detail.module.css';
import { Field, FieldGroup, missing } from './trace-fields';

/** The words shown for a run judged before calibration records were kept (no record to name). */
export const NO_CALIBRATION_RECORD = 'No calibration record (run before records were kept)';

/** An expanded uncertainty with its unit, as few digits as written: "± 0.004 V", "± 1.5 mV". */
export function formatU(value: number, unit: string): string {
  const text = Number(value.toPrecision(4)).toString();
  return `± ${text}${unit === '%' ? ' %' : ` ${unit}`}`;
}

/** A file size in B, kB or MB (1 kB = 1024 B, as the fixtures page writes it). */
function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} kB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

/** Saves a fetched certificate under its own name (the browser's download, no new tab). */
function saveBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  window.setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

function CertificateDownload({ calibration: c }: { calibration: RunCalibration }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const file = c.certificateFile;
  if (!file) return <span className={classes.dim}>no PDF on file</span>;
  const download = async () => {
    setBusy(true);
    setError(null);
    try {
      saveBlob(await getCalibrationCertificate(c.fixtureId, c.id), file.fileName);
    } catch (e) {
      setError(isApiError(e) ? e.message : 'The certificate could not be fetched. Try again.');
    } finally {
      setBusy(false);
    }
  };
  return (
    <>
      <Button
        variant="default"
        size="compact-sm"
        leftSection={<IconDownload size={14} aria-hidden />}
        loading={busy}
        onClick={() => void download()}
        aria-label={`Download certificate ${c.certificateNumber ?? ''} (PDF, ${formatSize(file.sizeBytes)})`}
        title={file.fileName}
      >
        PDF · {formatSize(file.sizeBytes)}
      </Button>
      {error && (
        <Text size="sm" c="signalRed.8" role="alert">
          {error}
        </Text>
      )}
    </>
  );
}

/**
 * The calibration record a run was judged with: its dates, who recorded it, the certificate, and the expanded
 * uncertainty per quantity that set the run's guard bands (docs/calibration.md). A run from before records were
 * kept says so in words.
 */
export function CalibrationUsed({ calibration: c, fixtureCode, fixtureId }: { calibration: RunCalibration | null; fixtureCode: string; fixtureId: number }) {
  const user = useUser();
  const fixturesLink = canOpen(user.data, pages.fixtures) ? (
    <Anchor component={Link} to={pages.fixtures.href()} size="sm" data-testid="trace-fixtures-link">
      {fixtureCode} on the Fixtures page
    </Anchor>
  ) : null;
  return (
    <section className={classes.calibration} aria-labelledby="trace-calibration-title" data-testid="trace-calibration-record" data-fixture-id={fixtureId}>
      <Group justify="space-between" align="baseline" mb={4} wrap="wrap">
        <h3 className={classes.groupTitle} id="trace-calibration-title">
          Calibration the run was judged with
        </h3>
        {fixturesLink}
      </Group>
      {c === null ? (
        <Text size="sm" c="dimmed">
          {NO_CALIBRATION_RECORD}
        </Text>
      ) : (
        <div className={classes.calibrationGrid}>
          <FieldGroup title="Certificate and dates">
            <Field label="Record" mono testId="trace-cal-id">
              #{c.id}
              {c.current ? <span className={classes.dim}> (still in force)</span> : <span className={classes.dim}> (since replaced by a later calibration)</span>}
            </Field>
            <Field label="Certificate" mono testId="trace-cal-certificate">
              {c.certificateNumber ?? missing}
            </Field>
            <Field label="Calibrated on" mono testId="trace-cal-calibrated">
              {c.calibratedAt ? formatDay(c.calibratedAt) : missing}
            </Field>
            <Field label="Due" mono testId="trace-cal-due">
              {formatDay(c.dueAt)}
            </Field>
            <Field label="Recorded by" testId="trace-cal-by">
              {c.recordedBy ?? <span className={classes.dim}>carried over by the upgrade</span>}
              <span className={classes.dim}> · {formatStamp(c.recordedAt)}</span>
            </Field>
            <Field label="Certificate PDF" testId="trace-cal-pdf">
              <CertificateDownload calibration={c} />
            </Field>
          </FieldGroup>
          <div className={classes.group}>
            <Table className={classes.table} aria-label="Uncertainty used for guard banding" withTableBorder={false} verticalSpacing={4}>
              <Table.Thead>
                <Table.Tr>
                  <Table.Th>Quantity</Table.Th>
                  <Table.Th className={classes.num}>U (k = 2)</Table.Th>
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {c.uncertainties.map((u) => (
                  <Table.Tr key={u.quantity}>
                    <Table.Td>
                      {u.name} <span className={classes.stepKey}>{u.quantity}</span>
                    </Table.Td>
                    <Table.Td className={`${classes.mono} ${classes.num}`}>{formatU(u.uncertainty, u.unit)}</Table.Td>
                  </Table.Tr>
                ))}
                <Table.Tr>
                  <Table.Td>
                    Voltmeter <span className={classes.dim}>(volt limits with no U stated above or in the plan)</span>
                  </Table.Td>
                  <Table.Td className={`${classes.mono} ${classes.num}`}>{formatU(c.voltageUncertaintyV, 'V')}</Table.Td>
                </Table.Tr>
              </Table.Tbody>
            </Table>
            <Text size="xs" c="dimmed" mt={4}>
              {c.uncertainties.length === 0
                ? 'The certificate states no uncertainty per quantity: each limit kept the plan’s own value.'
                : 'A quantity listed here replaced the plan’s value in the guard bands; any other kept the plan’s. Each measurement below shows the U it was judged with.'}
            </Text>
          </div>
        </div>
      )}
    </section>
  );
}
