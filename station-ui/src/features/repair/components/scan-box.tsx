import { TextInput } from '@mantine/core';
import { IconBarcode } from '@tabler/icons-react';
import { useEffect, useRef, useState } from 'react';
import classes from './repair.module.css';

/** Typing settles this long before the queue is asked (a scanner's keystrokes end with Enter instead). */
export const SEARCH_SETTLE_MS = 300;

interface ScanBoxProps {
  value: string;
  onSearch: (text: string) => void;
}

/**
 * Scan the repair tag's barcode (the scanner types the serial and Enter) or type any part of a serial, in any
 * case. Enter applies at once and selects the text, so the next scan replaces it.
 */
export function ScanBox({ value, onSearch }: ScanBoxProps) {
  const [text, setText] = useState(value);
  const input = useRef<HTMLInputElement>(null);
  useEffect(() => setText(value), [value]);
  useEffect(() => {
    if (text.trim() === value) return;
    const timer = setTimeout(() => onSearch(text.trim()), SEARCH_SETTLE_MS);
    return () => clearTimeout(timer);
  }, [text, value, onSearch]);
  return (
    <TextInput
      ref={input}
      label="Scan or type a serial"
      description="Repair tag barcode, or any part of the serial"
      placeholder="e.g. K5A-2648-00017 or 00017"
      leftSection={<IconBarcode size={18} aria-hidden />}
      className={classes.scan}
      w={300}
      maxLength={64}
      autoFocus
      autoComplete="off"
      spellCheck={false}
      value={text}
      onChange={(e) => setText(e.currentTarget.value)}
      onKeyDown={(e) => {
        if (e.key !== 'Enter') return;
        e.preventDefault();
        onSearch(text.trim());
        input.current?.select();
      }}
    />
  );
}
