import { Button } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { IconDownload } from '@tabler/icons-react';
import { useState } from 'react';
import { exportMeasurements, type ExportScope } from '../api/export-measurements';
import type { YieldFilters } from '../api/yield-filters';

/** Downloads the measurements behind the screen as CSV (RFC 4180), with the screen's filters. */
export function ExportButton({ filters, scope, label = 'Export measurements (CSV)' }: { filters: YieldFilters; scope?: ExportScope; label?: string }) {
  const [busy, setBusy] = useState(false);
  const run = async () => {
    setBusy(true);
    try {
      const { blob, fileName } = await exportMeasurements(filters, scope);
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = fileName;
      document.body.appendChild(a);
      a.click();
      a.remove();
      window.setTimeout(() => URL.revokeObjectURL(url), 10_000);
    } catch (e) {
      notifications.show({ color: 'signalRed', title: 'Export failed', message: e instanceof Error ? e.message : 'The export could not be made.' });
    } finally {
      setBusy(false);
    }
  };
  return (
    <Button variant="default" leftSection={<IconDownload size={16} aria-hidden />} loading={busy} onClick={() => void run()}>
      {label}
    </Button>
  );
}
