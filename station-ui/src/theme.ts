import { Alert, createTheme, type MantineColorsTuple, type ModalProps } from '@mantine/core';
import { STOPPED_WORD } from '@contract/run-outcome';

/*
 * Railwright's own palette, chosen by the team (not borrowed from another product). Each tuple runs light (0)
 * to dark (9); shade 6 is the named base colour, so `color="copper"` in light mode is #b06a32.
 */
const graphite: MantineColorsTuple = [
  '#f4f5f6', '#e7e9eb', '#d0d3d7', '#b4b9bf', '#949aa2',
  '#767d86', '#5c636b', '#464b52', '#31353a', '#1f2226',
];
const copper: MantineColorsTuple = [
  '#fbf3ec', '#f3e1d1', '#e7c3a4', '#daa275', '#cf864d',
  '#c5773b', '#b06a32', '#92572a', '#764622', '#5a351a',
];
const signalGreen: MantineColorsTuple = [
  '#e9f6ee', '#cfeada', '#a2d5b6', '#70bf8f', '#47ac6e',
  '#2f9c5a', '#1f8a4c', '#19733f', '#135c32', '#0d4525',
];
const signalRed: MantineColorsTuple = [
  '#fcecea', '#f6d1cd', '#eda49c', '#e2776b', '#d85546',
  '#cd4536', '#c0392b', '#a02f24', '#80261d', '#601c15',
];
const signalAmber: MantineColorsTuple = [
  '#fdf6e3', '#f8e8b9', '#f0d27e', '#e8bb44', '#e0a918',
  '#d69a00', '#c98a00', '#a77300', '#855c00', '#634400',
];
const slate: MantineColorsTuple = [
  '#f1f3f5', '#dfe3e8', '#c3c9d2', '#a3acb8', '#88929f',
  '#737e8c', '#5f6b7a', '#4f5966', '#3f4752', '#2f353d',
];

export const fontStacks = {
  text: "'Atkinson Hyperlegible', system-ui, -apple-system, 'Segoe UI', sans-serif",
  figures: "'JetBrains Mono', ui-monospace, 'Cascadia Mono', 'DejaVu Sans Mono', monospace",
} as const;

export const theme = createTheme({
  primaryColor: 'copper',
  primaryShade: { light: 6, dark: 5 },
  colors: { graphite, copper, signalGreen, signalRed, signalAmber, slate, gray: graphite, dark: darkFromGraphite() },
  black: graphite[9],
  white: '#ffffff',
  fontFamily: fontStacks.text,
  fontFamilyMonospace: fontStacks.figures,
  headings: { fontFamily: fontStacks.text, fontWeight: '700' },
  defaultRadius: 'sm',
  focusRing: 'auto',
  cursorType: 'pointer',
  components: {
    // a plain object, not Modal.extend(): importing Modal here put the modal, its focus handling and
    // floating-ui into the entry chunk every page (and the sign-in page) loads first (issue 11)
    Modal: {
      styles: { title: { fontSize: 'var(--mantine-font-size-xl)', fontWeight: 700 } },
    } satisfies { styles: ModalProps['styles'] },
    // Refusals and errors are read by people standing at a station: not smaller than body text.
    Alert: Alert.extend({
      styles: { message: { fontSize: 'var(--mantine-font-size-md)' }, title: { fontSize: 'var(--mantine-font-size-md)' } },
    }),
  },
  other: {
    /** Smallest step value on the operator screen: the operator stands 1–2 m from the screen and must read it there. */
    operatorFigurePx: 24,
    /** Smallest verdict word on the operator screen. */
    operatorVerdictPx: 96,
  },
});

/** Mantine's dark scheme reads `dark`; map it onto graphite (0 lightest text … 9 deepest surface). */
function darkFromGraphite(): MantineColorsTuple {
  return ['#d0d3d7', '#b4b9bf', '#949aa2', '#5c636b', '#3a3f45', '#2c3035', '#24272b', '#1c1f22', '#16181b', '#101214'];
}

/**
 * What every verdict looks like: a word, a shape and a colour together, never colour alone.
 * Keys are the API's verdict values (run verdicts plus the measurement verdict `guard_fail`).
 */
export type Verdict = 'pass' | 'fail' | 'error' | 'aborted' | 'guard_fail';

export type VerdictShape = 'circle-check' | 'square-cross' | 'triangle-exclamation' | 'bar';

export interface VerdictLook {
  /** The word shown, in capitals so it reads at a distance */
  word: string;
  /** Extra words that change the meaning (the guard-band case) */
  note?: string;
  /** Theme colour name (shade 6 is the base) */
  color: 'signalGreen' | 'signalRed' | 'signalAmber' | 'slate';
  shape: VerdictShape;
  /** Sentence for screen readers and tooltips */
  description: string;
}

export const verdictLooks: Record<Verdict, VerdictLook> = {
  pass: { word: 'PASS', color: 'signalGreen', shape: 'circle-check', description: 'Passed every limit' },
  fail: { word: 'FAIL', color: 'signalRed', shape: 'square-cross', description: 'Outside a specification limit' },
  error: {
    word: 'ERROR',
    color: 'signalAmber',
    shape: 'triangle-exclamation',
    description: 'Fixture or software fault: the unit was not judged',
  },
  // one word for a stopped run everywhere (issue 12), from the shared contract
  aborted: { word: STOPPED_WORD, color: 'slate', shape: 'bar', description: 'Stopped before the end; the unit was not judged' },
  guard_fail: {
    word: 'FAIL',
    note: 'inside spec, outside guard band',
    color: 'signalRed',
    shape: 'square-cross',
    description: 'Inside the specification limits but outside the guarded acceptance limits',
  },
};

export const verdicts = Object.keys(verdictLooks) as Verdict[];

export function isVerdict(v: unknown): v is Verdict {
  return typeof v === 'string' && Object.hasOwn(verdictLooks, v);
}
