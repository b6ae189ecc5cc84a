import { Alert, Button, Group, List, Modal, Stack, Text, Textarea, Title } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { IconCertificate, IconCircleCheck, IconDownload, IconLock } from '@tabler/icons-react';
import { useState } from 'react';
import { apiPaths } from '@/config/paths';
import { hasAnyRole, useUser } from '@/lib/auth';
import { fetchFile, saveFile, useCloseLot, useReleaseCheck, useReleaseLot } from '../api/lots-api';
import type { LotDetail } from '../api/types';
import { formatWhen } from '../lot-words';

/** Only quality and administrators release and close lots (the server checks the same). */
const RELEASERS = ['quality', 'admin'] as const;

/** Downloads the stored certificate of conformance. */
export function CertificateButton({ lot }: { lot: Pick<LotDetail, 'id' | 'code'> }) {
  const [busy, setBusy] = useState(false);
  const download = async () => {
    setBusy(true);
    try {
      saveFile(await fetchFile(apiPaths.lotCertificate(lot.id), `certificate-of-conformance-${lot.code}.pdf`));
    } catch (e) {
      notifications.show({ color: 'signalRed', title: 'The certificate could not be downloaded', message: e instanceof Error ? e.message : 'Try again.' });
    } finally {
      setBusy(false);
    }
  };
  return (
    <Button variant="light" leftSection={<IconDownload size={16} aria-hidden />} loading={busy} onClick={() => void download()}>
      Download certificate of conformance (PDF)
    </Button>
  );
}

/** Release (with what blocks it, in words), the certificate once released, and closing a released lot. */
export function ReleasePanel({ lot }: { lot: LotDetail }) {
  const me = useUser();
  const mayRelease = hasAnyRole(me.data, RELEASERS);
  const releasable = lot.state === 'open' || lot.state === 'on_hold';
  const check = useReleaseCheck(lot.id, releasable);
  const release = useReleaseLot();
  const close = useCloseLot();
  const [confirming, setConfirming] = useState(false);
  const [closing, setClosing] = useState(false);
  const [comment, setComment] = useState('');
  const [reason, setReason] = useState('');

  return (
    <Stack gap="sm" aria-label="Release">
      <Title order={3} fz="lg">
        Release
      </Title>
      {releasable && check.isPending && <Text c="dimmed">Checking whether the lot can be released…</Text>}
      {releasable && check.isError && <Alert color="signalRed" variant="light" title="The release check failed">{check.error.message}</Alert>}
      {releasable && check.data && !check.data.releasable && (
        <Alert color="signalAmber" variant="light" title="Not ready to release" role="status">
          <List size="sm" spacing={4}>
            {check.data.blockers.map((b) => (
              <List.Item key={b.code}>
                {b.message}
                {b.serials && b.serials.length > 0 && (
                  <Text span size="xs" c="dimmed" ff="monospace">
                    {' '}
                    ({b.serials.slice(0, 5).join(', ')}
                    {b.serials.length > 5 ? ', …' : ''})
                  </Text>
                )}
              </List.Item>
            ))}
          </List>
        </Alert>
      )}
      {releasable && check.data?.releasable && (
        <Alert color="signalGreen" variant="light" icon={<IconCircleCheck aria-hidden />} title="Ready to release" role="status">
          Every unit has a final pass or was scrapped, and no hold is active.
        </Alert>
      )}
      {releasable && mayRelease && (
        <Group>
          <Button leftSection={<IconCertificate size={16} aria-hidden />} disabled={!check.data?.releasable} onClick={() => setConfirming(true)}>
            Release lot
          </Button>
        </Group>
      )}
      {releasable && !mayRelease && <Text size="sm" c="dimmed">Quality or an administrator releases a lot.</Text>}

      {(lot.state === 'released' || lot.state === 'closed') && (
        <Stack gap="xs">
          <Text>
            Released {formatWhen(lot.releasedAt)}
            {lot.releasedBy ? ` by ${lot.releasedBy}` : ''}.
          </Text>
          {lot.hasCertificate ? <Group><CertificateButton lot={lot} /></Group> : <Text size="sm" c="dimmed">Released before certificates were issued; there is no certificate for this lot.</Text>}
        </Stack>
      )}
      {lot.state === 'closed' && (
        <Text>
          Closed {formatWhen(lot.closedAt)}
          {lot.closedBy ? ` by ${lot.closedBy}` : ''}: {lot.closeReason}
        </Text>
      )}
      {lot.state === 'released' && mayRelease && (
        <Group>
          <Button variant="default" leftSection={<IconLock size={16} aria-hidden />} onClick={() => setClosing(true)}>
            Close lot
          </Button>
        </Group>
      )}

      <Modal opened={confirming} onClose={() => setConfirming(false)} title={`Release lot ${lot.code}?`}>
        <Stack gap="sm">
          <Text size="sm">
            {lot.unitCounts.passed} units passed and {lot.unitCounts.scrapped} were scrapped. Releasing issues the certificate of conformance and ends
            testing of this lot. It cannot be undone.
          </Text>
          <Textarea label="Comment (optional, printed on the certificate)" value={comment} onChange={(e) => setComment(e.currentTarget.value)} maxLength={500} rows={3} />
          {release.isError && (
            <Alert color="signalRed" variant="light" role="alert" title="The lot was not released">
              {release.error.message}
            </Alert>
          )}
          <Group justify="flex-end">
            <Button variant="default" onClick={() => setConfirming(false)}>
              Cancel
            </Button>
            <Button
              loading={release.isPending}
              onClick={() =>
                release.mutate(
                  { id: lot.id, comment },
                  {
                    onSuccess: () => {
                      setConfirming(false);
                      setComment('');
                      notifications.show({ color: 'signalGreen', title: `Lot ${lot.code} released`, message: 'The certificate of conformance is ready to download.' });
                    },
                  },
                )
              }
            >
              Release and issue certificate
            </Button>
          </Group>
        </Stack>
      </Modal>

      <Modal opened={closing} onClose={() => setClosing(false)} title={`Close lot ${lot.code}`}>
        <Stack gap="sm">
          <Textarea label="Why is the lot closed?" value={reason} onChange={(e) => setReason(e.currentTarget.value)} maxLength={500} rows={3} required />
          {close.isError && (
            <Alert color="signalRed" variant="light" role="alert" title="The lot was not closed">
              {close.error.message}
            </Alert>
          )}
          <Group justify="flex-end">
            <Button variant="default" onClick={() => setClosing(false)}>
              Cancel
            </Button>
            <Button
              disabled={reason.trim().length < 3}
              loading={close.isPending}
              onClick={() => close.mutate({ id: lot.id, reason }, { onSuccess: () => { setClosing(false); setReason(''); } })}
            >
              Close lot
            </Button>
          </Group>
        </Stack>
      </Modal>
    </Stack>
  );
}
