import { Popover, Text, TextInput } from '@mantine/core';
import { IconBarcode } from '@tabler/icons-react';
import { useEffect, useRef, useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { apiPaths, paths } from '@/config/paths';
import { api, isApiError } from '@/lib/api-client';
import classes from './app-layout.module.css';

/** Longest serial the server accepts; longer input is a scan error. */
const MAX_SERIAL = 64;
/** A barcode scanner types faster than any person: keys closer than this belong to one scan (common practice, no source). */
export const SCAN_KEY_GAP_MS = 50;
const MIN_SCAN_LENGTH = 4;

function isEditable(el: EventTarget | null): boolean {
  if (!(el instanceof HTMLElement)) return false;
  return el.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(el.tagName);
}

/**
 * A scan while no field has the focus: quick keystrokes ending in Enter. Typing into a field is never taken,
 * and slow typing on the page is ignored (it is not a scan).
 */
export function useScanWedge(onScan: (text: string) => void): void {
  const latest = useRef(onScan);
  latest.current = onScan;
  useEffect(() => {
    let buffer = '';
    let last = 0;
    const onKey = (e: KeyboardEvent) => {
      if (e.ctrlKey || e.altKey || e.metaKey || isEditable(e.target)) return;
      const now = Date.now();
      if (now - last > SCAN_KEY_GAP_MS) buffer = '';
      last = now;
      if (e.key === 'Enter') {
        if (buffer.length >= MIN_SCAN_LENGTH) {
          e.preventDefault();
          latest.current(buffer);
        }
        buffer = '';
      } else if (e.key.length === 1) {
        buffer += e.key;
      }
    };
    document.addEventListener('keydown', onKey);
    return () => document.removeEventListener('keydown', onKey);
  }, []);
}

/**
 * The serial box in the header of every office screen: scan or type a serial (any case) and press Enter to open
 * that unit's history. An unknown serial is said in words under the box; the page stays where it was.
 */
export function SerialSearch() {
  const navigate = useNavigate();
  const [value, setValue] = useState('');
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  const open = async (raw: string) => {
    const serial = raw.trim().toUpperCase();
    if (!serial) {
      setMessage('Scan or type a serial, then press Enter.');
      return;
    }
    if (serial.length > MAX_SERIAL) {
      setMessage(`A serial has at most ${MAX_SERIAL} characters; this looks like a wrong scan.`);
      return;
    }
    setBusy(true);
    try {
      await api.get(apiPaths.unit(serial));
      setMessage(null);
      setValue('');
      input.current?.blur();
      void navigate(paths.unitHistory.href(serial));
    } catch (err) {
      setValue(serial);
      setMessage(isApiError(err) && err.status === 404 ? `No unit with serial ${serial} is registered. Check the label.` : err instanceof Error ? err.message : 'The serial could not be looked up.');
    } finally {
      setBusy(false);
    }
  };

  useScanWedge((text) => void open(text));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    void open(value);
  };

  return (
    <Popover opened={message !== null} onChange={(o) => !o && setMessage(null)} position="bottom-start" withArrow shadow="md" width={320}>
      <Popover.Target>
        <form onSubmit={submit} role="search" aria-label="Find a unit" className={classes.search}>
          <TextInput
            ref={input}
            size="sm"
            value={value}
            onChange={(e) => {
              setValue(e.currentTarget.value);
              if (message) setMessage(null);
            }}
            onKeyDown={(e) => e.key === 'Escape' && setMessage(null)}
            placeholder="Scan or type a serial"
            aria-label="Serial"
            aria-describedby={message ? 'serial-search-message' : undefined}
            leftSection={<IconBarcode size={18} aria-hidden />}
            maxLength={MAX_SERIAL + 8}
            spellCheck={false}
            autoComplete="off"
            disabled={busy}
            classNames={{ input: classes.searchInput }}
          />
        </form>
      </Popover.Target>
      <Popover.Dropdown>
        <Text size="sm" id="serial-search-message" role="alert">
          {message}
        </Text>
      </Popover.Dropdown>
    </Popover>
  );
}
