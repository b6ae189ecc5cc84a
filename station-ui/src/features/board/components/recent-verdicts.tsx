import { VerdictShape } from '@/components/verdict';
import { verdictLooks } from '@/theme';
import type { BoardLastRun } from '../api/get-board';
import classes from './board.module.css';

/** Words on the board: the same as the operator's, so a stopped test reads the same everywhere on the floor. */
const boardWords: Record<BoardLastRun['verdict'], string> = { pass: 'PASS', fail: 'FAIL', error: 'ERROR', aborted: 'STOPPED' };

/**
 * The last verdicts as a row of marks, newest on the left: shape and colour at a distance, the word for a
 * closer look (tooltip and screen readers), and the first letter under each mark for colour-blind eyes.
 */
export function RecentVerdicts({ runs, max = 10 }: { runs: BoardLastRun[]; max?: number }) {
  const shown = runs.slice(0, max);
  if (shown.length === 0) return <span className={classes.muted}>No units tested yet</span>;
  return (
    <ol className={classes.recent} aria-label="Last verdicts, newest first">
      {shown.map((r) => {
        const look = verdictLooks[r.verdict];
        const word = boardWords[r.verdict];
        return (
          <li
            key={r.id}
            className={classes.recentItem}
            data-verdict={r.verdict}
            title={`${word} · ${r.serial}`}
            style={{ color: `var(--mantine-color-${look.color}-4)` }}
          >
            <VerdictShape shape={look.shape} size={46} />
            <span className={classes.recentLetter} aria-hidden="true">
              {word[0]}
            </span>
            <span className={classes.visuallyHidden}>
              {word} {r.serial}
            </span>
          </li>
        );
      })}
    </ol>
  );
}
