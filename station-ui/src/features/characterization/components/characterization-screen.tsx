import { Group, NumberInput, Paper, Select, SimpleGrid, Skeleton, Stack, Text, Title } from '@mantine/core';
import { useDebouncedValue } from '@mantine/hooks';
import { DEFAULT_SUGGESTION_K, DEFAULT_SUGGESTION_UNCERTAINTY } from '@contract/limit-suggestion';
import { formatFigure } from '@contract/value-format';
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { useAnalysis, useDataSets } from '../api/characterization-api';
import { columnDigits, numberOrUndefined } from './characterization-format';
import { DataHistogram } from './data-histogram';
import { FiguresPanel } from './figures-panel';
import { PutIntoDraft } from './put-into-draft';
import { DEFAULT_SUGGESTION_INPUT, readSuggestionSettings, SuggestionSettings, type SuggestionInput } from './suggestion-settings';
import { UploadPanel } from './upload-panel';

function Section({ id, title, children, actions }: { id: string; title: string; children: ReactNode; actions?: ReactNode }) {
  return (
    <Paper withBorder p="md" component="section" aria-labelledby={id}>
      <Group justify="space-between" mb="sm" wrap="wrap">
        <Title order={2} fz="xl" id={id}>
          {title}
        </Title>
        {actions}
      </Group>
      {children}
    </Paper>
  );
}

/** Engineering → Limits from data: upload a pilot build, read one quantity's figures, put proposed limits into a draft. */
export function CharacterizationScreen() {
  const sets = useDataSets();
  const [setId, setSetId] = useState<number | null>(null);
  const [columnKey, setColumnKey] = useState<string | null>(null);
  const [lowText, setLowText] = useState<string | number>('');
  const [highText, setHighText] = useState<string | number>('');
  const [settingsInput, setSettingsInput] = useState<SuggestionInput>(DEFAULT_SUGGESTION_INPUT);
  // the last k and U both fields accepted: a refused value stays on its field and the figures keep the last good ones
  const [settings, setSettings] = useState({ k: DEFAULT_SUGGESTION_K, uncertainty: DEFAULT_SUGGESTION_UNCERTAINTY });
  const read = readSuggestionSettings(settingsInput);
  const readK = read.ok ? read.k : null;
  const readU = read.ok ? read.uncertainty : null;
  useEffect(() => {
    if (readK !== null && readU !== null) setSettings((was) => (was.k === readK && was.uncertainty === readU ? was : { k: readK, uncertainty: readU }));
  }, [readK, readU]);

  const dataSet = sets.data?.find((d) => d.id === setId) ?? null;
  const column = dataSet?.columns.find((c) => c.key === columnKey) ?? null;
  useEffect(() => {
    if (setId === null && sets.data && sets.data.length > 0) setSetId(sets.data[0]!.id);
  }, [setId, sets.data]);
  useEffect(() => {
    if (dataSet && !column) setColumnKey(dataSet.columns[0]?.key ?? null);
  }, [dataSet, column]);

  const low = numberOrUndefined(lowText);
  const high = numberOrUndefined(highText);
  const crossed = low !== undefined && high !== undefined && !(low < high);
  // one object per change of a value (not per render), so the debounce settles instead of firing again every 300 ms
  const wanted = useMemo(() => ({ low: crossed ? undefined : low, high: crossed ? undefined : high, k: settings.k, uncertainty: settings.uncertainty }), [crossed, low, high, settings]);
  const [asked] = useDebouncedValue(wanted, 300);
  const params = column ? { column: column.key, low: asked.low, high: asked.high, k: asked.k, uncertainty: asked.uncertainty } : null;
  const analysis = useAnalysis(dataSet?.id ?? null, params);

  const chooseColumn = (key: string | null) => {
    setColumnKey(key);
    setLowText('');
    setHighText('');
  };
  const sameColumn = analysis.data?.column.key === column?.key;
  const suggestion = sameColumn ? analysis.data?.suggestion : null;
  const d = column ? columnDigits(column, [low, high]) : 3;
  const useSuggested = () => {
    if (!suggestion) return;
    setLowText(suggestion.tolerance.low !== undefined ? Number(formatFigure(suggestion.tolerance.low, d)) : '');
    setHighText(suggestion.tolerance.high !== undefined ? Number(formatFigure(suggestion.tolerance.high, d)) : '');
  };

  return (
    <Stack gap="lg">
      <PageHeader title="Limits from data" description="Upload a pilot build's measurements, read the figures of one quantity, and put proposed limits into a draft plan." />
      <SimpleGrid cols={{ base: 1, md: 2 }} spacing="lg">
        <Section id="ch-upload" title="Upload a pilot build">
          <UploadPanel
            onUploaded={(d) => {
              setSetId(d.id);
              chooseColumn(d.columns[0]?.key ?? null);
            }}
          />
        </Section>
        <Section id="ch-data" title="Data set and quantity">
          {sets.isPending ? (
            <Skeleton h={120} />
          ) : sets.isError ? (
            <ErrorNotice error={sets.error} title="Data sets could not be loaded" onRetry={() => void sets.refetch()} />
          ) : sets.data.length === 0 ? (
            <Text c="dimmed">No data set yet. Upload a CSV of a pilot build to start.</Text>
          ) : (
            <Stack gap="sm">
              <Select
                label="Data set"
                data={sets.data.map((s) => ({ value: String(s.id), label: `${s.name} (${s.rowCount} units)` }))}
                value={setId === null ? null : String(setId)}
                onChange={(v) => {
                  setSetId(v === null ? null : Number(v));
                  chooseColumn(null);
                }}
                allowDeselect={false}
              />
              {dataSet && (
                <Text size="xs" c="dimmed">
                  {dataSet.fileName} · {dataSet.product ? dataSet.product.partNumber : 'no product stated'} · uploaded by {dataSet.uploadedBy.displayName},{' '}
                  {new Date(dataSet.uploadedAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}
                </Text>
              )}
              <Select
                label="Quantity"
                data={(dataSet?.columns ?? []).map((c) => ({ value: c.key, label: `${c.key} — ${c.count} values` }))}
                value={columnKey}
                onChange={chooseColumn}
                allowDeselect={false}
                searchable
              />
            </Stack>
          )}
        </Section>
      </SimpleGrid>

      {dataSet && column && (
        <Section id="ch-figures" title={`Figures of ${column.key}`}>
          <Stack gap="md">
            <Group align="flex-end" gap="md" wrap="wrap">
              <NumberInput label={`Proposed low (${column.unit})`} placeholder="none" value={lowText} onChange={setLowText} decimalScale={6} w={190} ff="monospace" />
              <NumberInput
                label={`Proposed high (${column.unit})`}
                placeholder="none"
                value={highText}
                onChange={setHighText}
                decimalScale={6}
                w={190}
                ff="monospace"
                error={crossed ? 'must be above the low limit' : undefined}
              />
            </Group>
            <Text size="xs" c="dimmed">
              Leave a field empty for a one-sided limit. The figures follow as you type.
            </Text>
            <SuggestionSettings
              column={column}
              input={settingsInput}
              onChange={setSettingsInput}
              suggestion={suggestion}
              sd={sameColumn ? analysis.data?.sd : null}
              digits={d}
              onUseSuggested={useSuggested}
            />
            {analysis.isPending ? (
              <Skeleton h={320} />
            ) : analysis.isError ? (
              <ErrorNotice error={analysis.error} title="The figures could not be computed" onRetry={() => void analysis.refetch()} />
            ) : (
              <SimpleGrid cols={{ base: 1, lg: 2 }} spacing="lg">
                <DataHistogram analysis={analysis.data} />
                <FiguresPanel analysis={analysis.data} />
              </SimpleGrid>
            )}
          </Stack>
        </Section>
      )}

      {dataSet && column && (
        <Section id="ch-accept" title="Put into a draft plan">
          <PutIntoDraft
            dataSet={dataSet}
            column={column}
            low={crossed ? undefined : low}
            high={crossed ? undefined : high}
            settings={read.ok ? { k: read.k, uncertainty: read.uncertainty } : null}
            summary={{
              n: analysis.data?.n ?? column.count,
              ppk: analysis.data?.capability?.ppk.value ?? null,
              ppm: analysis.data?.ppmOutside?.total ?? null,
            }}
          />
        </Section>
      )}
    </Stack>
  );
}
