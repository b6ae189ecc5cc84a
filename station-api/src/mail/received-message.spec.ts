import { describe, expect, it } from 'vitest';
import { decodeEncodedWords, decodeQuotedPrintable, parseSimpleMessage } from './received-message';

describe('reading a captured message', () => {
  it('decodes RFC 2047 encoded words (Q and B)', () => {
    // RFC 2047 §8 examples use ISO-8859-1; these are the UTF-8 equivalents: "é" is C3 A9, "σ" is CF 83
    expect(decodeEncodedWords('=?UTF-8?Q?Caf=C3=A9_ouvert?=')).toBe('Café ouvert');
    expect(decodeEncodedWords('=?UTF-8?B?z4MgbGltaXQ=?=')).toBe('σ limit');
    // RFC 2047 §6.2: white space between adjacent encoded words is dropped
    expect(decodeEncodedWords('=?UTF-8?Q?a?= =?UTF-8?Q?b?=')).toBe('ab');
    expect(decodeEncodedWords('plain subject')).toBe('plain subject');
  });

  it('decodes quoted-printable with soft line breaks (RFC 2045 §6.7)', () => {
    expect(decodeQuotedPrintable('88 =E2=80=93 92=\r\n %')).toBe('88 – 92 %');
  });

  it('splits headers from the body and unfolds long headers', () => {
    const raw = 'From: a@b\r\nSubject: Lot LB-1\r\n is on hold\r\nContent-Transfer-Encoding: quoted-printable\r\n\r\nReason: 90 =25\r\n';
    expect(parseSimpleMessage(raw)).toEqual({ subject: 'Lot LB-1 is on hold', text: 'Reason: 90 %' });
  });
});
