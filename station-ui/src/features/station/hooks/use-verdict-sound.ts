import { useCallback, useRef, useState } from 'react';
import type { FinishedVerdict } from '../live-run';

const MUTE_KEY = 'railwright.station.muted';

/** One generated tone: frequency in Hz, start and length in seconds from "now". */
interface Tone {
  hz: number;
  atS: number;
  lengthS: number;
  wave: OscillatorType;
}

/**
 * The cues, generated on the spot (no sound files). Pass rises, fail is low and repeated, so the two are
 * told apart without looking; an error falls. Frequencies and lengths are our own choice (common
 * practice, no source): short enough not to annoy over a shift, in the 200 Hz–1 kHz band that carries
 * over fan noise.
 */
export const verdictTones: Record<FinishedVerdict, Tone[]> = {
  pass: [
    { hz: 660, atS: 0, lengthS: 0.12, wave: 'sine' },
    { hz: 990, atS: 0.14, lengthS: 0.18, wave: 'sine' },
  ],
  fail: [
    { hz: 220, atS: 0, lengthS: 0.16, wave: 'square' },
    { hz: 220, atS: 0.22, lengthS: 0.16, wave: 'square' },
    { hz: 220, atS: 0.44, lengthS: 0.16, wave: 'square' },
  ],
  error: [
    { hz: 520, atS: 0, lengthS: 0.16, wave: 'triangle' },
    { hz: 350, atS: 0.2, lengthS: 0.3, wave: 'triangle' },
  ],
  aborted: [{ hz: 440, atS: 0, lengthS: 0.12, wave: 'sine' }],
};

function readMuted(): boolean {
  try {
    return window.localStorage.getItem(MUTE_KEY) === '1';
  } catch {
    return false;
  }
}

/**
 * Audible verdict cues with the Web Audio API, and a mute switch remembered in this browser. Browsers
 * only start audio after a user gesture, so `unlock()` is called from the scan (the Enter key press).
 */
export function useVerdictSound() {
  const [muted, setMuted] = useState(readMuted);
  const ctxRef = useRef<AudioContext | null>(null);

  const unlock = useCallback(() => {
    if (typeof window.AudioContext !== 'function') return;
    try {
      ctxRef.current ??= new window.AudioContext();
      if (ctxRef.current.state === 'suspended') void ctxRef.current.resume();
    } catch {
      // no audio device: the screen works silently
    }
  }, []);

  const play = useCallback(
    (verdict: FinishedVerdict) => {
      const ctx = ctxRef.current;
      if (muted || !ctx) return;
      const t0 = ctx.currentTime + 0.02;
      for (const tone of verdictTones[verdict]) {
        const osc = ctx.createOscillator();
        const gain = ctx.createGain();
        osc.type = tone.wave;
        osc.frequency.value = tone.hz;
        // 10 ms ramps avoid the click of a tone switched on and off abruptly
        gain.gain.setValueAtTime(0, t0 + tone.atS);
        gain.gain.linearRampToValueAtTime(0.25, t0 + tone.atS + 0.01);
        gain.gain.setValueAtTime(0.25, t0 + tone.atS + tone.lengthS - 0.01);
        gain.gain.linearRampToValueAtTime(0, t0 + tone.atS + tone.lengthS);
        osc.connect(gain).connect(ctx.destination);
        osc.start(t0 + tone.atS);
        osc.stop(t0 + tone.atS + tone.lengthS + 0.02);
      }
    },
    [muted],
  );

  const toggleMuted = useCallback(() => {
    setMuted((was) => {
      const next = !was;
      try {
        window.localStorage.setItem(MUTE_KEY, next ? '1' : '0');
      } catch {
        // storage blocked: the switch lasts until reload
      }
      return next;
    });
  }, []);

  return { muted, toggleMuted, unlock, play };
}
