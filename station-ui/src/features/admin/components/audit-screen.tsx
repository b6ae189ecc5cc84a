import { Button, Code, Group, Pagination, Paper, Skeleton, Stack, Table, Text, TextInput } from '@mantine/core';
import { useForm } from '@mantine/form';
import { IconFilter, IconX } from '@tabler/icons-react';
import { useEffect } from 'react';
import { useSearchParams } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { useAudit, type AuditEntry, type AuditFilters } from '../api/get-audit';
import classes from './audit-screen.module.css';

const PAGE_SIZE = 50;

interface FilterValues {
  action: string;
  entityType: string;
  entityId: string;
}

const emptyFilters: FilterValues = { action: '', entityType: '', entityId: '' };

/** Filters live in the address, so a filtered view can be bookmarked or sent to a colleague. */
function filtersFromParams(params: URLSearchParams): { filters: FilterValues; page: number } {
  const page = Number.parseInt(params.get('page') ?? '1', 10);
  return {
    filters: {
      action: params.get('action') ?? '',
      entityType: params.get('entityType') ?? '',
      entityId: params.get('entityId') ?? '',
    },
    page: Number.isFinite(page) && page >= 1 ? page : 1,
  };
}

function paramsFrom(filters: FilterValues, page: number): URLSearchParams {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filters)) if (v.trim()) params.set(k, v.trim());
  if (page > 1) params.set('page', String(page));
  return params;
}

function toQuery(v: FilterValues, page: number): AuditFilters {
  return {
    action: v.action.trim() || undefined,
    entityType: v.entityType.trim() || undefined,
    entityId: v.entityId.trim() || undefined,
    limit: PAGE_SIZE,
    offset: (page - 1) * PAGE_SIZE,
  };
}

/** Local time as yyyy-mm-dd hh:mm:ss: sortable by eye and the same width on every row. */
export function formatStamp(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}:${p(d.getSeconds())}`;
}

function actorOf(e: AuditEntry): string {
  return e.actorName ?? (e.actorId !== null ? `#${e.actorId}` : '—');
}

/** The fields that changed, as "field: before → after". */
export function describeChange(before?: Record<string, unknown> | null, after?: Record<string, unknown> | null): string[] {
  const keys = Array.from(new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})]));
  const show = (v: unknown) => (v === undefined ? '—' : typeof v === 'string' ? v : JSON.stringify(v));
  return keys
    .filter((k) => JSON.stringify(before?.[k]) !== JSON.stringify(after?.[k]))
    .map((k) => (before && after ? `${k}: ${show(before[k])} → ${show(after[k])}` : `${k}: ${show((after ?? before)?.[k])}`));
}

/** Admin → Audit log: who changed what and why, newest first, read-only. */
export function AuditScreen() {
  const [params, setParams] = useSearchParams();
  const { filters: applied, page } = filtersFromParams(params);
  const audit = useAudit(toQuery(applied, page));
  const form = useForm<FilterValues>({
    initialValues: emptyFilters,
    validate: {
      // The server caps each filter at 64 characters.
      action: (v) => (v.length > 64 ? 'At most 64 characters.' : null),
      entityType: (v) => (v.length > 64 ? 'At most 64 characters.' : null),
      entityId: (v) => (v.length > 64 ? 'At most 64 characters.' : null),
    },
  });

  // Back and forward change the address; keep the fields showing what is applied.
  const { setValues } = form;
  const appliedKey = JSON.stringify(applied);
  useEffect(() => {
    setValues(JSON.parse(appliedKey) as FilterValues);
  }, [appliedKey, setValues]);

  const apply = form.onSubmit((v) => setParams(paramsFrom(v, 1)));
  const clear = () => {
    form.setValues(emptyFilters);
    setParams(new URLSearchParams());
  };
  const setPage = (p: number) => setParams(paramsFrom(applied, p));

  const total = audit.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));

  return (
    <>
      <PageHeader title="Audit log" description="Every sign-in, change and override, with who did it and why. Entries cannot be edited." />
      <Paper withBorder p="md" mb="lg" radius="md" component="form" onSubmit={apply} aria-label="Filter the audit log">
        <Group align="flex-end" gap="md" wrap="wrap">
          <TextInput
            label="Action"
            description="Exact name"
            placeholder="e.g. auth.login_failed"
            w={220}
            className={classes.monoInput}
            {...form.getInputProps('action')}
          />
          <TextInput
            label="Record type"
            description="What was changed"
            placeholder="e.g. user"
            w={180}
            className={classes.monoInput}
            {...form.getInputProps('entityType')}
          />
          <TextInput
            label="Record id"
            description="Its number"
            placeholder="e.g. 3"
            w={140}
            className={classes.monoInput}
            {...form.getInputProps('entityId')}
          />
          <Group gap="xs">
            <Button type="submit" leftSection={<IconFilter size={16} aria-hidden />}>
              Show
            </Button>
            <Button variant="default" leftSection={<IconX size={16} aria-hidden />} onClick={clear}>
              Clear
            </Button>
          </Group>
        </Group>
      </Paper>

      {audit.isPending ? (
        <Stack gap="xs" aria-busy="true" aria-label="Loading the audit log">
          {[0, 1, 2, 3, 4].map((i) => (
            <Skeleton key={i} height={36} />
          ))}
        </Stack>
      ) : audit.isError ? (
        <ErrorNotice error={audit.error} title="The audit log could not be loaded" onRetry={() => audit.refetch()} />
      ) : audit.data.items.length === 0 ? (
        <Text c="dimmed" size="lg" py="xl" ta="center">
          No entries match these filters.
        </Text>
      ) : (
        <>
          <Text size="sm" c="dimmed" mb="xs" aria-live="polite">
            {total} {total === 1 ? 'entry' : 'entries'}
            {pages > 1 ? ` · page ${page} of ${pages}` : ''}
          </Text>
          <Table.ScrollContainer minWidth={880}>
            <Table
              verticalSpacing="xs"
              highlightOnHover
              aria-label="Audit entries"
              aria-busy={audit.isFetching}
              className={classes.table}
            >
              <Table.Thead>
                <Table.Tr>
                  <Table.Th w={180}>When</Table.Th>
                  <Table.Th>Who</Table.Th>
                  <Table.Th>Action</Table.Th>
                  <Table.Th>Record</Table.Th>
                  <Table.Th>Reason and changes</Table.Th>
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {audit.data.items.map((e) => {
                  const changes = describeChange(e.before, e.after);
                  return (
                    <Table.Tr key={e.id}>
                      <Table.Td className={classes.mono}>{formatStamp(e.at)}</Table.Td>
                      <Table.Td className={classes.mono}>{actorOf(e)}</Table.Td>
                      <Table.Td>
                        <Code>{e.action}</Code>
                      </Table.Td>
                      <Table.Td>
                        <span className={classes.mono}>
                          {e.entityType}
                          {e.entityId && ` #${e.entityId}`}
                        </span>
                      </Table.Td>
                      <Table.Td>
                        {e.reason && <Text size="sm">{e.reason}</Text>}
                        {changes.map((c) => (
                          <Text key={c} size="xs" c="dimmed" className={classes.change}>
                            {c}
                          </Text>
                        ))}
                      </Table.Td>
                    </Table.Tr>
                  );
                })}
              </Table.Tbody>
            </Table>
          </Table.ScrollContainer>
          {pages > 1 && <Pagination mt="md" total={pages} value={page} onChange={setPage} aria-label="Audit pages" />}
        </>
      )}
    </>
  );
}
