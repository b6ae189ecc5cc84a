import { ActionIcon, Anchor, Box, Button, Group, Pagination, Paper, Select, Skeleton, Stack, Table, Text, TextInput, VisuallyHidden } from '@mantine/core';
import { IconChevronDown, IconChevronRight, IconDownload, IconFilter, IconX } from '@tabler/icons-react';
import { Fragment, useEffect, useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { exportAudit } from '../api/export-audit';
import { useAudit, useAuditChoices } from '../api/get-audit';
import type { AuditChange, AuditEntry } from '../api/audit-types';
import { auditFiltersFromParams, auditParamsFrom, auditQueryFrom, emptyAuditFilters, rangeProblem, type AuditFilters } from '../audit-filters';
import { auditLinkHref } from '../audit-links';
import classes from './audit-screen.module.css';

export const AUDIT_PAGE_SIZE = 50;

/** Local time as yyyy-mm-dd hh:mm: sortable by eye and the same width on every row. */
export function formatStamp(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}`;
}

function who(e: AuditEntry): string {
  if (e.actorDisplayName) return e.actorDisplayName;
  return e.actorName ?? 'the system';
}

function ChangeList({ changes }: { changes: AuditChange[] }) {
  return (
    <dl className={classes.changes} aria-label="Before and after">
      {changes.map((c, i) => (
        <Fragment key={`${c.field}-${i}`}>
          <dt>{c.field}</dt>
          <dd>
            {c.before !== null && c.after !== null ? (
              <>
                <span className={classes.before}>{c.before}</span> → {c.after}
              </>
            ) : c.after !== null ? (
              c.after
            ) : (
              <>
                <span className={classes.before}>{c.before}</span> (removed)
              </>
            )}
          </dd>
        </Fragment>
      ))}
    </dl>
  );
}

function AuditRow({ e }: { e: AuditEntry }) {
  const [open, setOpen] = useState(false);
  const href = auditLinkHref(e.link);
  const rowId = `audit-changes-${e.id}`;
  return (
    <>
      <Table.Tr>
        <Table.Td w={44}>
          {e.changes.length > 0 && (
            <ActionIcon
              variant="subtle"
              color="graphite"
              onClick={() => setOpen((o) => !o)}
              aria-expanded={open}
              aria-controls={rowId}
              aria-label={open ? `Hide before and after of record ${e.id}` : `Show before and after of record ${e.id}`}
            >
              {open ? <IconChevronDown size={18} aria-hidden /> : <IconChevronRight size={18} aria-hidden />}
            </ActionIcon>
          )}
        </Table.Td>
        <Table.Td className={classes.mono} title={new Date(e.at).toISOString()}>
          {formatStamp(e.at)}
        </Table.Td>
        <Table.Td className={classes.who} title={e.actorName ?? undefined}>
          {who(e)}
        </Table.Td>
        <Table.Td className={classes.what}>
          {href ? (
            <Anchor component={Link} to={href} title={e.link ? `Open ${e.link.label}` : undefined}>
              {e.what}
            </Anchor>
          ) : (
            e.what
          )}
        </Table.Td>
        <Table.Td className={classes.what}>{e.reason ?? <Text span c="dimmed">—</Text>}</Table.Td>
      </Table.Tr>
      {open && (
        <Table.Tr id={rowId} className={classes.changesRow}>
          <Table.Td />
          <Table.Td colSpan={4}>
            <ChangeList changes={e.changes} />
          </Table.Td>
        </Table.Tr>
      )}
    </>
  );
}

/** Quality → Audit trail: every change with who, when, what in words and why, filtered through the address. */
export function AuditScreen() {
  const [params, setParams] = useSearchParams();
  const { filters: applied, page } = auditFiltersFromParams(params);
  const query = auditQueryFrom(applied);
  const appliedProblem = rangeProblem(applied);
  const audit = useAudit({ ...query, limit: AUDIT_PAGE_SIZE, offset: (page - 1) * AUDIT_PAGE_SIZE }, !appliedProblem);
  const choices = useAuditChoices();
  const [draft, setDraft] = useState<AuditFilters>(applied);
  const [exporting, setExporting] = useState(false);
  const [exportError, setExportError] = useState<unknown>(null);

  // back and forward change the address; keep the fields showing what is applied
  const appliedKey = JSON.stringify(applied);
  useEffect(() => setDraft(JSON.parse(appliedKey) as AuditFilters), [appliedKey]);

  const draftProblem = rangeProblem(draft);
  const apply = (ev: FormEvent) => {
    ev.preventDefault();
    if (draftProblem) return;
    setParams(auditParamsFrom(draft, 1));
  };
  const choose = (change: Partial<AuditFilters>) => {
    const next = { ...draft, ...change };
    setDraft(next);
    if (!rangeProblem(next)) setParams(auditParamsFrom(next, 1));
  };
  const clear = () => setParams(new URLSearchParams());
  const setPage = (p: number) => setParams(auditParamsFrom(applied, p));
  const hasFilters = JSON.stringify(applied) !== JSON.stringify(emptyAuditFilters);

  const download = async () => {
    setExporting(true);
    setExportError(null);
    try {
      const { blob, fileName } = await exportAudit(query);
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = fileName;
      a.click();
      URL.revokeObjectURL(url);
    } catch (err) {
      setExportError(err);
    } finally {
      setExporting(false);
    }
  };

  const total = audit.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / AUDIT_PAGE_SIZE));
  const typeOptions = (choices.data?.entityTypes ?? []).map((t) => ({ value: t.type, label: t.words[0].toUpperCase() + t.words.slice(1) }));
  if (applied.type && !typeOptions.some((o) => o.value === applied.type)) typeOptions.push({ value: applied.type, label: applied.type });
  const userOptions = (choices.data?.users ?? []).map((u) => ({ value: u.username, label: `${u.displayName} (${u.username})` }));
  if (applied.user && !userOptions.some((o) => o.value === applied.user)) userOptions.push({ value: applied.user, label: applied.user });

  return (
    <>
      <PageHeader
        title="Audit trail"
        description="Every change to plans, limits, fixtures, calibrations, users, lots and units: who, when, what and why. Records cannot be edited or deleted."
      />
      <Paper withBorder p="md" mb="lg" radius="md" component="form" onSubmit={apply} aria-label="Filter the audit trail">
        <Group align="flex-start" gap="md" wrap="wrap">
          <TextInput
            label="Search"
            description="Reason, person, object or values"
            placeholder="e.g. vout or K5A-2649"
            w={240}
            value={draft.q}
            maxLength={100}
            onChange={(ev) => setDraft({ ...draft, q: ev.currentTarget.value })}
          />
          <Select
            label="Object"
            description="What was changed"
            placeholder="Any"
            w={180}
            data={typeOptions}
            value={draft.type || null}
            onChange={(v) => choose({ type: v ?? '', id: v ? draft.id : '' })}
            clearable
          />
          <TextInput
            label="Object id"
            description={draft.type === 'unit' ? 'Serial or number' : 'Its number'}
            placeholder={draft.type === 'unit' ? 'e.g. K5A-2649-00017' : 'e.g. 3'}
            w={170}
            value={draft.id}
            maxLength={64}
            onChange={(ev) => setDraft({ ...draft, id: ev.currentTarget.value })}
          />
          <Select
            label="Person"
            description="Who did it"
            placeholder="Anyone"
            w={220}
            data={userOptions}
            value={draft.user || null}
            onChange={(v) => choose({ user: v ?? '' })}
            searchable
            clearable
          />
          <TextInput
            type="date"
            label="From"
            description="First day"
            w={160}
            value={draft.from}
            onChange={(ev) => setDraft({ ...draft, from: ev.currentTarget.value })}
            error={draftProblem && draft.from && draft.to && draft.from > draft.to ? draftProblem : undefined}
          />
          <TextInput type="date" label="To" description="Last day" w={160} value={draft.to} onChange={(ev) => setDraft({ ...draft, to: ev.currentTarget.value })} />
        </Group>
        <Group gap="xs" mt="md">
          <Button type="submit" leftSection={<IconFilter size={16} aria-hidden />}>
            Show
          </Button>
          <Button variant="default" leftSection={<IconX size={16} aria-hidden />} onClick={clear} disabled={!hasFilters}>
            Clear filters
          </Button>
          <Button variant="default" leftSection={<IconDownload size={16} aria-hidden />} onClick={() => void download()} loading={exporting} disabled={!!appliedProblem}>
            Export CSV
          </Button>
          {applied.action && (
            <Text size="sm" c="dimmed">
              Only the action <code>{applied.action}</code> (from the link you followed).
            </Text>
          )}
        </Group>
      </Paper>
      {exportError !== null && (
        <Box mb="md">
          <ErrorNotice error={exportError} title="The audit trail could not be exported" />
        </Box>
      )}

      {appliedProblem ? (
        <Text c="signalRed" py="md" role="alert">
          {appliedProblem}
        </Text>
      ) : audit.isPending ? (
        <Stack gap="xs" aria-busy="true" aria-label="Loading the audit trail">
          {[0, 1, 2, 3, 4].map((i) => (
            <Skeleton key={i} height={36} />
          ))}
        </Stack>
      ) : audit.isError ? (
        <ErrorNotice error={audit.error} title="The audit trail could not be loaded" onRetry={() => audit.refetch()} />
      ) : audit.data.items.length === 0 ? (
        <Text c="dimmed" size="lg" py="xl" ta="center">
          No records match these filters.
        </Text>
      ) : (
        <>
          <Text size="sm" c="dimmed" mb="xs" aria-live="polite">
            {total} {total === 1 ? 'record' : 'records'}
            {pages > 1 ? ` · page ${page} of ${pages}` : ''} · newest first · times in local time
          </Text>
          <Table.ScrollContainer minWidth={700}>
            <Table verticalSpacing="xs" highlightOnHover aria-label="Audit records" aria-busy={audit.isFetching} className={classes.table}>
              <Table.Thead>
                <Table.Tr>
                  <Table.Th w={44}>
                    <VisuallyHidden>Details</VisuallyHidden>
                  </Table.Th>
                  <Table.Th w={140}>When</Table.Th>
                  <Table.Th w={140}>Who</Table.Th>
                  <Table.Th>What</Table.Th>
                  <Table.Th w="26%">Why</Table.Th>
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {audit.data.items.map((e) => (
                  <AuditRow key={e.id} e={e} />
                ))}
              </Table.Tbody>
            </Table>
          </Table.ScrollContainer>
          {pages > 1 && <Pagination mt="md" total={pages} value={page} onChange={setPage} aria-label="Audit pages" />}
        </>
      )}
    </>
  );
}
