import { Button, Loader } from '@mantine/core';
import { IconMaximize } from '@tabler/icons-react';
import { useEffect, useRef, useState } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { isApiError } from '@/lib/api-client';
import { useBoard } from '../api/get-board';
import { useBoardLive } from '../hooks/use-board-live';
import classes from './board.module.css';
import { StationTile } from './station-tile';

export const BOARD_LINK_EXPIRED = 'Board link expired — ask an administrator for a new one';

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

export interface BoardScreenProps {
  /**
   * The wall screen's board-only token (`/board?display=<token>`): the board fills the screen without the
   * app's frame, and a refused token says so on the board instead of going to the sign-in page.
   */
  displayToken?: string;
}

/**
 * The line board (`/board`) for a wall screen read from 3–5 m: every station at once, live, nothing to
 * click. Dark surfaces cut glare; states and verdicts carry word, shape and colour. The tiles share the
 * screen's height, so a long blocked reason never pushes another station off it.
 */
export function BoardScreen({ displayToken }: BoardScreenProps) {
  const board = useBoard(displayToken);
  const [expired, setExpired] = useState(false);
  const live = useBoardLive({ displayToken, onAuthError: displayToken ? () => setExpired(true) : undefined });
  const rootRef = useRef<HTMLDivElement>(null);
  const refused = isApiError(board.error) && (board.error.status === 401 || board.error.status === 403);
  const linkExpired = !!displayToken && (expired || refused);

  return (
    <div className={classes.board} ref={rootRef} data-testid="board" data-display={displayToken ? 'wall' : undefined}>
      <div className={classes.boardHead}>
        <h1 className={classes.boardTitle}>Line board</h1>
        {!linkExpired && live.status === 'offline' && !live.refused && (
          <span className={classes.linkLost} role="status">
            Live link lost — reconnecting
          </span>
        )}
        {!linkExpired && live.refused && (
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
      {linkExpired ? (
        <p className={classes.expired} role="alert">
          {BOARD_LINK_EXPIRED}
        </p>
      ) : (
        <>
          {board.isPending && <Loader color="copper" aria-label="Loading the board" />}
          {board.isError && <ErrorNotice error={board.error} title="The board could not be loaded" onRetry={() => board.refetch()} />}
          {board.data && (
            <div className={classes.grid} data-count={board.data.length}>
              {board.data.map((tile) => (
                <StationTile key={tile.station.id} tile={tile} />
              ))}
            </div>
          )}
        </>
      )}
    </div>
  );
}
