import { useCallback, useEffect, useRef, useState } from 'react';
import { getRepairTag } from '@/lib/repair-tag';

export type RepairTagState =
  | { kind: 'idle' }
  | { kind: 'loading' }
  | { kind: 'opened'; url: string }
  | { kind: 'failed'; message: string };

/**
 * Fetches a failed run's repair tag with the signed-in token and opens it in a new tab. The tab is opened
 * before the fetch (inside the click) because browsers block windows opened later; if it is blocked anyway,
 * the blob address stays on the page as a link.
 */
export function useOpenRepairTag(runId: number) {
  const [state, setState] = useState<RepairTagState>({ kind: 'idle' });
  const urlRef = useRef<string | null>(null);

  useEffect(
    () => () => {
      if (urlRef.current) URL.revokeObjectURL(urlRef.current);
    },
    [],
  );

  const open = useCallback(async () => {
    const tab = window.open('', '_blank');
    setState({ kind: 'loading' });
    try {
      const blob = await getRepairTag(runId);
      if (urlRef.current) URL.revokeObjectURL(urlRef.current);
      const url = URL.createObjectURL(blob);
      urlRef.current = url;
      if (tab) tab.location.href = url;
      setState({ kind: 'opened', url });
    } catch (err) {
      tab?.close();
      setState({ kind: 'failed', message: err instanceof Error ? err.message : 'The repair tag could not be opened.' });
    }
  }, [runId]);

  return { state, open };
}
