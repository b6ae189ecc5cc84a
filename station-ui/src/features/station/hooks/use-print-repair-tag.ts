import { useCallback, useEffect, useRef, useState } from 'react';
import { getRepairTag } from '@/lib/repair-tag';

export type PrintState =
  | { kind: 'idle' }
  | { kind: 'loading'; runId: number }
  | { kind: 'sent'; runId: number; url: string }
  | { kind: 'failed'; runId: number; message: string };

/**
 * Fetches a failed run's repair tag and sends it to the printer from a hidden frame, so the operator
 * stays on the station screen. The blob address stays available ("open the tag") in case the browser
 * will not print from a frame.
 */
export function usePrintRepairTag() {
  const [state, setState] = useState<PrintState>({ kind: 'idle' });
  const frameRef = useRef<HTMLIFrameElement | null>(null);
  const urlRef = useRef<string | null>(null);

  const cleanup = useCallback(() => {
    frameRef.current?.remove();
    frameRef.current = null;
    if (urlRef.current) URL.revokeObjectURL(urlRef.current);
    urlRef.current = null;
  }, []);

  useEffect(() => cleanup, [cleanup]);

  const print = useCallback(
    async (runId: number) => {
      cleanup();
      setState({ kind: 'loading', runId });
      try {
        const blob = await getRepairTag(runId);
        const url = URL.createObjectURL(blob);
        urlRef.current = url;
        const frame = document.createElement('iframe');
        frame.title = 'Repair tag';
        frame.setAttribute('aria-hidden', 'true');
        frame.style.cssText = 'position:fixed;right:0;bottom:0;width:0;height:0;border:0;visibility:hidden';
        frame.onload = () => {
          try {
            frame.contentWindow?.focus();
            frame.contentWindow?.print();
          } catch {
            // the browser will not print from the frame: the "open the tag" link remains
          }
        };
        frame.src = url;
        document.body.appendChild(frame);
        frameRef.current = frame;
        setState({ kind: 'sent', runId, url });
      } catch (err) {
        setState({ kind: 'failed', runId, message: err instanceof Error ? err.message : 'The repair tag could not be printed.' });
      }
    },
    [cleanup],
  );

  const reset = useCallback(() => {
    cleanup();
    setState({ kind: 'idle' });
  }, [cleanup]);

  return { state, print, reset };
}
