import { CloseButton } from '@mantine/core';
import { VerdictShape } from '@/components/verdict';
import type { RefusalMessage } from '../refusal-messages';
import classes from './station-screen.module.css';

export interface ScanNoticeProps {
  refusal: RefusalMessage;
  /** True when a test or a verdict is on screen: the refusal is about the other scan, not that unit */
  besideRun: boolean;
  onDismiss: () => void;
}

/**
 * A refused scan, in its own strip between the scan field and the result panel: it never takes the
 * panel's place, so a verdict (or a test in progress) stays in sight while the operator reads it.
 */
export function ScanNotice({ refusal, besideRun, onDismiss }: ScanNoticeProps) {
  return (
    <section className={classes.notice} data-refusal={refusal.code} role="alert" data-testid="refusal" aria-label={`Scan refused: ${refusal.title}`}>
      <VerdictShape shape="triangle-exclamation" size={40} className={classes.noticeShape} />
      <div className={classes.noticeText}>
        <span className={classes.noticeTitle}>{refusal.title}</span>
        <span className={classes.noticeDetail}>{refusal.detail}</span>
        <span className={classes.noticeHint}>
          {besideRun ? 'This scan started nothing; the unit below is not affected.' : 'No test was started. Scan the next unit when ready.'}
        </span>
      </div>
      <CloseButton size="lg" onClick={onDismiss} aria-label="Dismiss this message" className={classes.noticeClose} />
    </section>
  );
}
