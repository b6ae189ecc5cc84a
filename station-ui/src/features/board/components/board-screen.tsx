import { Button, Loader } from '@mantine/core';
import { IconMaximize } from '@tabler/icons-react';
import { useEffect, useRef, useState } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { useBoard } from '../api/get-board';
import { useBoardLive } from '../hooks/use-board-live';
import classes from './board.module.css';
import { StationTile } from './station-tile';

function WallClock() {
  const [now, setNow] = useState(() => new Date());
  useEffect(() => {
    const t = window.setInterval(() => setNow(new Date()), 10_000);
    return () => window.clearInterval(t);
  }, []);
  return (
    <span className={classes.clock}>
      {now.toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit', hour12: false })}
    </span>
  );
}

/**
 * The line board (`/board`) for a wall screen read from 3–5 m: every station at once, live, nothing to
 * click. Dark surfaces cut glare; states and verdicts carry word, shape and colour.
 */
export function BoardScreen() {
  const board = useBoard();
  const link = useBoardLive();
  const rootRef = useRef<HTMLDivElement>(null);

  return (
    <div className={classes.board} ref={rootRef} data-testid="board">
      <div className={classes.boardHead}>
        <h1 className={classes.boardTitle}>Line board</h1>
        {link === 'lost' && (
          <span className={classes.linkLost} role="status">
            Live link lost — reconnecting
          </span>
        )}
        {link === 'refused' && (
          <span className={classes.linkLost} role="status">
            Live link refused — sign in again
          </span>
        )}
        <WallClock />
        {typeof document !== 'undefined' && document.fullscreenEnabled && (
          <Button
            variant="subtle"
            color="graphite.2"
            size="sm"
            leftSection={<IconMaximize size={18} aria-hidden />}
            onClick={() => void rootRef.current?.requestFullscreen().catch(() => undefined)}
          >
            Full screen
          </Button>
        )}
      </div>
      {board.isPending && <Loader color="copper" aria-label="Loading the board" />}
      {board.isError && <ErrorNotice error={board.error} title="The board could not be loaded" onRetry={() => board.refetch()} />}
      {board.data && (
        <div className={classes.grid}>
          {board.data.map((tile) => (
            <StationTile key={tile.station.id} tile={tile} />
          ))}
        </div>
      )}
    </div>
  );
}
