import { Alert, Loader, Stack, Text, UnstyledButton } from '@mantine/core';
import { useEffect, useRef } from 'react';
import { StationStateMark } from '@/components/station-state';
import { ErrorNotice } from '@/components/errors/error-notice';
import { useStations } from '../api/get-stations';
import classes from './station-screen.module.css';

export interface StationPickerProps {
  selectedId: number | null;
  onPick: (stationId: number) => void;
  /** Put the focus on the first station at once (the first-time page; a dialog focuses by itself) */
  autoFocusFirst?: boolean;
}

/** Which station this screen drives: one large button per station, reachable with Tab and Enter. */
export function StationPicker({ selectedId, onPick, autoFocusFirst = false }: StationPickerProps) {
  const stations = useStations();
  const firstRef = useRef<HTMLButtonElement>(null);
  const loaded = stations.isSuccess;
  useEffect(() => {
    if (autoFocusFirst && loaded) firstRef.current?.focus();
  }, [autoFocusFirst, loaded]);
  if (stations.isPending) return <Loader color="copper" aria-label="Loading the stations" />;
  if (stations.isError) return <ErrorNotice error={stations.error} title="The stations could not be loaded" onRetry={() => stations.refetch()} />;
  const list = stations.data.filter((s) => s.active);
  if (list.length === 0) {
    return (
      <Alert color="signalAmber" title="No station is set up">
        An engineer adds stations on the engineering screens.
      </Alert>
    );
  }
  return (
    <Stack component="ul" gap="sm" aria-label="Stations" className={classes.pickList}>
      {list.map((s, i) => (
        <li key={s.id}>
          <UnstyledButton
            ref={i === 0 ? firstRef : undefined}
            className={classes.pickItem}
            data-selected={s.id === selectedId ? 'yes' : 'no'}
            data-autofocus={i === 0 ? true : undefined}
            onClick={() => onPick(s.id)}
            aria-label={`${s.code}, ${s.name}`}
          >
            <span className={classes.pickCode}>{s.code}</span>
            <span className={classes.pickName}>
              {s.name}
              <Text span c="dimmed" fz={16} display="block">
                {s.activeLot ? `Lot ${s.activeLot.code} · ${s.activeLot.partNumber}` : 'No lot assigned'}
                {s.fixture ? ` · fixture ${s.fixture.code}` : ''}
              </Text>
            </span>
            <StationStateMark state={s.state} sizePx={18} />
          </UnstyledButton>
        </li>
      ))}
    </Stack>
  );
}
