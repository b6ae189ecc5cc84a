import { Progress } from '@mantine/core';
import { IconCalendarDue } from '@tabler/icons-react';
import { formatFigure } from '@/components/figure';
import { StationStateMark } from '@/components/station-state';
import type { BoardStation } from '../api/get-board';
import { runsThisShift } from '../board-display';
import classes from './board.module.css';
import { RecentVerdicts } from './recent-verdicts';

/** One station on the wall board: state first, then what it is doing, then how the shift goes. */
export function StationTile({ tile }: { tile: BoardStation }) {
  const { station, state, reasons, activeLot, currentRun, lastRuns, shift } = tile;
  const alert = state === 'fault' || state === 'blocked';
  // sent by servers from issue 10 on (typed by hand until the API types are regenerated)
  const warnings = (tile as BoardStation & { warnings?: string[] }).warnings ?? [];
  return (
    <article className={classes.tile} data-state={state} aria-label={`Station ${station.code}`} data-testid={`tile-${station.code}`}>
      <header className={classes.tileHead}>
        <span className={classes.tileCode}>{station.code}</span>
        <span className={classes.tileName}>{station.name}</span>
      </header>
      <StationStateMark state={state} sizePx={34} solid />
      {alert && (
        <ul className={classes.alert} data-state={state} role="alert">
          {(reasons.length > 0 ? reasons : ['The station cannot test now.']).map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      )}
      {warnings.length > 0 && (
        // a heads-up, not an alarm: the station still tests
        <ul className={classes.notice} role="note" aria-label="Heads-up" data-testid={`warnings-${station.code}`}>
          {warnings.map((w) => (
            <li key={w}>
              <IconCalendarDue size={24} aria-hidden className={classes.noticeIcon} />
              <span>{w}</span>
            </li>
          ))}
        </ul>
      )}
      <div className={classes.lotLine}>
        {activeLot ? (
          <>
            <span className={classes.label}>Lot</span> <span className={classes.mono}>{activeLot.code}</span>
            <span className={classes.label}> · </span>
            <span className={classes.mono}>{activeLot.partNumber}</span>
          </>
        ) : (
          <span className={classes.muted}>No lot assigned</span>
        )}
      </div>
      <div className={classes.current} data-testid={`current-${station.code}`}>
        {currentRun ? (
          <>
            <div className={classes.currentSerial}>{currentRun.serial}</div>
            <div className={classes.currentStep}>
              Step {Math.min(currentRun.stepIndex + 1, currentRun.stepCount)} of {currentRun.stepCount}
              {currentRun.stepName ? `: ${currentRun.stepName}` : ''}
            </div>
            <Progress
              value={currentRun.stepCount > 0 ? (currentRun.stepIndex / currentRun.stepCount) * 100 : 0}
              size={14}
              color="copper"
              aria-label="Progress of the unit under test"
            />
          </>
        ) : (
          <div className={classes.muted}>No unit under test</div>
        )}
      </div>
      <div className={classes.recentBlock}>
        <span className={classes.label}>Last units this shift</span>
        <RecentVerdicts runs={runsThisShift(lastRuns, shift)} />
      </div>
      <footer className={classes.shift}>
        <span className={classes.shiftName}>{shift?.shiftName ?? 'This shift'}</span>
        <div className={classes.shiftFigure}>
          <span className={classes.shiftValue} data-testid={`fpy-${station.code}`}>
            {shift?.firstPassYieldPct === null || shift?.firstPassYieldPct === undefined ? '—' : `${formatFigure(shift.firstPassYieldPct, 1)}%`}
          </span>
          <span className={classes.label}>first-pass yield</span>
        </div>
        <div className={classes.shiftFigure}>
          <span className={classes.shiftValue} data-testid={`tested-${station.code}`}>
            {shift ? shift.tested : '—'}
          </span>
          <span className={classes.label}>tested</span>
        </div>
        <div className={classes.shiftFigure}>
          <span className={classes.shiftValue}>{shift ? shift.failed : '—'}</span>
          <span className={classes.label}>failed</span>
        </div>
      </footer>
    </article>
  );
}
