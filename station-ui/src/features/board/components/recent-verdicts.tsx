import { RUN_VERDICT_WORDS } from '@contract/run-outcome';
import { VerdictShape } from '@/components/verdict';
import { isVerdict, verdictLooks } from '@/theme';
import type { BoardLastRun } from '../api/get-board';
import classes from './board.module.css';

const p2 = (n: number) => String(n).padStart(2, '0');

/** Local time of day as hh:mm, or null without a usable time. */
export function clockTime(iso: string | undefined): string | null {
  if (!iso) return null;
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? null : `${p2(d.getHours())}:${p2(d.getMinutes())}`;
}

/**
 * This shift's last verdicts as a row of marks, newest on the left: shape and colour at a distance, the
 * first letter and the time under each mark, the word for a closer look (tooltip and screen readers). The
 * words are the same everywhere on the floor (a stopped test reads STOPPED).
 */
export function RecentVerdicts({ runs, max = 10 }: { runs: BoardLastRun[]; max?: number }) {
  const shown = runs.filter((r) => isVerdict(r.verdict)).slice(0, max);
  if (shown.length === 0) return <span className={classes.muted}>No units tested this shift</span>;
  return (
    <ol className={classes.recent} aria-label="Last verdicts, newest first">
      {shown.map((r) => {
        const verdict = r.verdict as Exclude<BoardLastRun['verdict'], 'running'>;
        const look = verdictLooks[verdict];
        const word = RUN_VERDICT_WORDS[verdict].toUpperCase();
        const time = clockTime(r.finishedAt);
        return (
          <li
            key={r.id}
            className={classes.recentItem}
            data-verdict={verdict}
            title={`${word} · ${r.serial}${time ? ` · ${time}` : ''}`}
            style={{ color: `var(--mantine-color-${look.color}-4)` }}
          >
            <VerdictShape shape={look.shape} size={46} />
            <span className={classes.recentLetter} aria-hidden="true">
              {word[0]}
            </span>
            {time && (
              <span className={classes.recentTime} aria-hidden="true" data-testid="recent-time">
                {time}
              </span>
            )}
            <span className={classes.visuallyHidden}>
              {word} {r.serial}
              {time ? ` at ${time}` : ''}
            </span>
          </li>
        );
      })}
    </ol>
  );
}
