import { useCallback, useState } from 'react';

const STATION_KEY = 'railwright.station.id';

function read(): number | null {
  try {
    const raw = window.localStorage.getItem(STATION_KEY);
    const id = raw === null ? NaN : Number(raw);
    return Number.isInteger(id) && id > 0 ? id : null;
  } catch {
    return null;
  }
}

/**
 * The station this screen drives, remembered in this browser's localStorage: a station PC is bolted to
 * one fixture, so the choice is made once and survives reloads and sign-outs.
 */
export function useRememberedStation(): [number | null, (id: number | null) => void] {
  const [stationId, setStationId] = useState<number | null>(read);
  const remember = useCallback((id: number | null) => {
    try {
      if (id === null) window.localStorage.removeItem(STATION_KEY);
      else window.localStorage.setItem(STATION_KEY, String(id));
    } catch {
      // storage blocked: the choice lasts until the page is reloaded
    }
    setStationId(id);
  }, []);
  return [stationId, remember];
}
