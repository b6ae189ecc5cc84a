import { useCallback, useEffect, useRef } from 'react';
import { BURST_PAUSE_MS, SafetyKeyGuard, type GuardAction, type GuardHint } from '../safety-keys';

export interface SafetyKeyHandlers {
  onConfirm: () => void;
  onCancel: () => void;
  /**
   * A character arrived while the prompt was open: close it, no power. Returns text already in the scan
   * field (the start of the same label), which the collected scan then begins with.
   */
  onBurstStart: () => string | void;
  /** The new scan is complete: send it to the scan flow */
  onBurstScan: (serial: string) => void;
  /** A person typed while the prompt was open: this text goes into the scan field */
  onBurstText: (text: string) => void;
  onHint: (hint: GuardHint) => void;
}

/**
 * Puts the safety prompt's key rules (safety-keys.ts) in front of every other key handler on the page
 * (a window listener in the capture phase) while the prompt is open or a scan typed into it is being
 * collected. Returns a check for the pointer confirmation.
 */
export function useSafetyKeys(opened: boolean, handlers: SafetyKeyHandlers): { pointerMayConfirm: () => boolean } {
  const guard = useRef(new SafetyKeyGuard());
  const handlersRef = useRef(handlers);
  handlersRef.current = handlers;

  useEffect(() => {
    if (opened) guard.current.open(performance.now());
    else guard.current.close();
  }, [opened]);

  useEffect(() => {
    let pauseTimer: number | undefined;
    const act = (a: GuardAction) => {
      const h = handlersRef.current;
      switch (a.kind) {
        case 'confirm':
          return h.onConfirm();
        case 'cancel':
          return h.onCancel();
        case 'burst_start': {
          const head = h.onBurstStart();
          if (head) guard.current.prepend(head);
          return;
        }
        case 'burst_scan':
          return h.onBurstScan(a.serial);
        case 'burst_text':
          return h.onBurstText(a.text);
        case 'swallow':
          if (a.hint) h.onHint(a.hint);
          return;
        default:
          return;
      }
    };
    const armPause = () => {
      window.clearTimeout(pauseTimer);
      if (!guard.current.collecting) return;
      pauseTimer = window.setTimeout(() => {
        const a = guard.current.pause(performance.now());
        if (a) act(a);
        else armPause();
      }, BURST_PAUSE_MS + 20);
    };
    const onKey = (e: KeyboardEvent) => {
      const a = guard.current.key(e, performance.now());
      if (a.kind === 'pass') return;
      // nothing behind the prompt (a focused button, the dialog's own Esc, the console's keys) sees it
      e.preventDefault();
      e.stopImmediatePropagation();
      act(a);
      armPause();
    };
    window.addEventListener('keydown', onKey, { capture: true });
    return () => {
      window.clearTimeout(pauseTimer);
      window.removeEventListener('keydown', onKey, { capture: true });
    };
  }, []);

  const pointerMayConfirm = useCallback(() => guard.current.pointerMayConfirm(performance.now()), []);
  return { pointerMayConfirm };
}
