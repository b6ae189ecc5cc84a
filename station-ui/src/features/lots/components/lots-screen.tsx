import { Button, Grid, Paper, Skeleton, Stack, Text } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { IconDownload, IconFileUpload, IconPlus } from '@tabler/icons-react';
import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { apiPaths } from '@/config/paths';
import { fetchFile, saveFile, useLots } from '../api/lots-api';
import { ImportLotsModal } from './import-lots-modal';
import { LotDetailPanel } from './lot-detail';
import { LotsTable } from './lots-table';
import { NewLotModal } from './new-lot-modal';

/** The `?lot=<id>` of the address: the lot shown beside the list (a link to it opens the same view). */
const LOT_PARAM = 'lot';

/** Lots: the list, a new lot or a lot file, and one lot's units, release and certificate. */
export function LotsScreen() {
  const lots = useLots();
  const [params, setParams] = useSearchParams();
  const selected = Number(params.get(LOT_PARAM)) || null;
  const select = (id: number) => setParams((p) => {
    p.set(LOT_PARAM, String(id));
    return p;
  });
  const [creating, setCreating] = useState(false);
  const [importing, setImporting] = useState(false);
  const [exporting, setExporting] = useState(false);

  const exportList = async () => {
    setExporting(true);
    try {
      saveFile(await fetchFile(apiPaths.lotsExport, 'railwright-lots.csv'));
    } catch (e) {
      notifications.show({ color: 'signalRed', title: 'Export failed', message: e instanceof Error ? e.message : 'Try again.' });
    } finally {
      setExporting(false);
    }
  };

  return (
    <>
      <PageHeader
        title="Lots"
        description="Open lots, follow their units, and release them with a certificate of conformance."
        actions={
          <>
            <Button variant="default" leftSection={<IconDownload size={16} aria-hidden />} loading={exporting} onClick={() => void exportList()}>
              Export CSV
            </Button>
            <Button variant="default" leftSection={<IconFileUpload size={16} aria-hidden />} onClick={() => setImporting(true)}>
              Import CSV
            </Button>
            <Button leftSection={<IconPlus size={16} aria-hidden />} onClick={() => setCreating(true)}>
              New lot
            </Button>
          </>
        }
      />
      <Grid gap="lg" align="flex-start">
        <Grid.Col span={{ base: 12, xl: selected ? 7 : 12 }}>
          <Paper withBorder p="md" radius="md">
            {lots.isError ? (
              <ErrorNotice error={lots.error} title="The lots could not be loaded" onRetry={() => void lots.refetch()} />
            ) : lots.isPending ? (
              <Stack gap="xs" aria-busy="true">
                <Skeleton h={36} />
                <Skeleton h={36} />
                <Skeleton h={36} />
              </Stack>
            ) : (
              <LotsTable lots={lots.data} selectedId={selected} onSelect={select} />
            )}
          </Paper>
        </Grid.Col>
        {selected ? (
          <Grid.Col span={{ base: 12, xl: 5 }}>
            <LotDetailPanel lotId={selected} />
          </Grid.Col>
        ) : (
          lots.data && lots.data.length > 0 && (
            <Grid.Col span={12}>
              <Text c="dimmed" size="sm">
                Choose a lot to see its units and to release it.
              </Text>
            </Grid.Col>
          )
        )}
      </Grid>
      <NewLotModal
        opened={creating}
        onClose={() => setCreating(false)}
        onCreated={(lot) => {
          setCreating(false);
          notifications.show({ color: 'signalGreen', title: `Lot ${lot.code} created`, message: `${lot.unitCounts.total} units registered.` });
          select(lot.id);
        }}
      />
      <ImportLotsModal
        opened={importing}
        onClose={() => setImporting(false)}
        onImported={(r) => notifications.show({ color: 'signalGreen', title: `${r.imported} ${r.imported === 1 ? 'lot' : 'lots'} imported`, message: r.lots.map((l) => l.code).join(', ') })}
      />
    </>
  );
}
