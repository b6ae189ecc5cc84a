import { TextInput } from '@mantine/core';
import { forwardRef, type FormEvent } from 'react';
import classes from './station-screen.module.css';

export interface ScanFieldProps {
  /** The text in the field (kept by the console, which may put text typed into the safety prompt here) */
  value: string;
  onValueChange: (text: string) => void;
  /** Called with the trimmed serial when Enter is pressed on a non-empty field */
  onScan: (serial: string) => void;
  /** While a scan is being checked (shown in the field); a new scan meanwhile replaces it */
  busy?: boolean;
  /** Called on every key press, so the audio can be unlocked by a user gesture */
  onKeyActivity?: () => void;
  onBlurToNowhere?: () => void;
}

/**
 * The scan field: the scanner types the serial and presses Enter. It is cleared after each scan so the
 * next label starts fresh, and it asks to get focus back when focus drops to nowhere.
 */
export const ScanField = forwardRef<HTMLInputElement, ScanFieldProps>(function ScanField(
  { value: text, onValueChange: setText, onScan, busy = false, onKeyActivity, onBlurToNowhere },
  ref,
) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const serial = text.trim();
    // also while the last scan is being checked: the newer label wins (the older one gets no safety prompt)
    if (!serial) return;
    setText('');
    onScan(serial);
  };

  return (
    <form onSubmit={submit} className={classes.scanForm} role="search" aria-label="Scan a unit">
      <TextInput
        ref={ref}
        value={text}
        onChange={(e) => setText(e.currentTarget.value)}
        onKeyDown={() => onKeyActivity?.()}
        onBlur={(e) => {
          // focus moving to another control is the operator's choice; focus lost to nothing is not
          if (!e.relatedTarget) onBlurToNowhere?.();
        }}
        label="Serial"
        placeholder="Scan the unit label"
        autoComplete="off"
        autoCorrect="off"
        autoCapitalize="characters"
        spellCheck={false}
        maxLength={64}
        size="xl"
        classNames={{ input: classes.scanInput, label: classes.scanLabel }}
        data-testid="scan-field"
        rightSection={busy ? <span className={classes.scanBusy}>checking…</span> : null}
        rightSectionWidth={busy ? 140 : undefined}
        aria-describedby="scan-help"
      />
      <span id="scan-help" className={classes.scanHelp}>
        Enter starts · Esc stops a test
      </span>
    </form>
  );
});
