import { Button } from '@mantine/core';
import { IconCalendarDue, IconVolume, IconVolumeOff } from '@tabler/icons-react';
import { StationStateMark, StationStateShapeIcon } from '@/components/station-state';
import type { LiveLinkState } from '@/lib/socket';
import type { StationStatus } from '../api/get-station-status';
import classes from './station-screen.module.css';

export interface StationHeaderProps {
  status: StationStatus | undefined;
  /** How the live link stands: the station's state is only shown while the screen hears the server */
  link: LiveLinkState;
  /** The status could not be fetched */
  statusFailed?: boolean;
  muted: boolean;
  onToggleMuted: () => void;
  onChangeStation: () => void;
}

/** Non-blocking warnings (calibration due soon, contacts nearly worn); absent from a server that sends none. */
function warningsOf(status: StationStatus): string[] {
  return (status as StationStatus & { warnings?: string[] }).warnings ?? [];
}

/** Which station this is, its state in words, the lot it runs; sound and station switches. */
function LinkMark({ link }: { link: Exclude<LiveLinkState, 'live'> }) {
  const offline = link !== 'connecting';
  return (
    <span className={classes.linkMark} data-link={link} data-testid="link-mark" role="status">
      <StationStateShapeIcon shape={offline ? 'triangle-exclamation' : 'ring'} size={24} />
      <span>{offline ? 'Server not reachable' : 'Connecting…'}</span>
    </span>
  );
}

export function StationHeader({ status, link, statusFailed = false, muted, onToggleMuted, onChangeStation }: StationHeaderProps) {
  // a green READY only while the screen hears the server: a stale state must not look like a live one
  const linkShown: LiveLinkState = statusFailed ? 'lost' : link;
  return (
    <header className={classes.header} data-testid="station-header">
      <div className={classes.headerStation}>
        <span className={classes.stationCode} data-testid="station-code" title={status?.stationName}>
          {status?.stationCode ?? '…'}
        </span>
        <span className={classes.stationName}>{status?.stationName}</span>
      </div>
      {linkShown !== 'live' ? <LinkMark link={linkShown} /> : status && <StationStateMark state={status.state} sizePx={22} />}
      {status && (status.state === 'blocked' || status.state === 'fault') && status.reasons.length > 0 && (
        // also while a verdict fills the panel below, the reason stays in sight
        <span className={classes.headerReasons} title={status.reasons.join('; ')} data-testid="header-reasons">
          {status.reasons.join('; ')}
        </span>
      )}
      {status && warningsOf(status).length > 0 && (
        // a heads-up, not an alarm: testing goes on; the words say what to book before it blocks
        <span className={classes.headerWarnings} title={warningsOf(status).join('; ')} data-testid="header-warnings" role="note">
          <IconCalendarDue size={20} aria-hidden />
          <span>
            <span className={classes.headerWarningsLabel}>Heads-up: </span>
            {warningsOf(status).join('; ')}
          </span>
        </span>
      )}
      <div className={classes.headerLot} data-testid="active-lot">
        {status?.activeLot ? (
          <>
            <span className={classes.headerLabel}>Lot</span>
            <span className={classes.headerFigure}>{status.activeLot.code}</span>
            <span className={classes.headerLabel}>Part</span>
            <span className={classes.headerFigure}>{status.activeLot.partNumber}</span>
          </>
        ) : (
          <span className={classes.headerLabel}>No lot assigned</span>
        )}
      </div>
      <div className={classes.headerActions}>
        <Button
          variant="default"
          size="md"
          onClick={onToggleMuted}
          aria-pressed={muted}
          // the words may be hidden on a narrow screen (only the icon shows); the name stays
          aria-label={muted ? 'Sound off' : 'Sound on'}
          leftSection={muted ? <IconVolumeOff size={20} aria-hidden /> : <IconVolume size={20} aria-hidden />}
        >
          <span className={classes.soundLabel}>{muted ? 'Sound off' : 'Sound on'}</span>
        </Button>
        <Button variant="default" size="md" onClick={onChangeStation}>
          Change station
        </Button>
      </div>
    </header>
  );
}
