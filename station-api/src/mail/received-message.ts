/** A message as the local capture server received it. */
export interface ReceivedMessage {
  /** Envelope sender (MAIL FROM) */
  from: string;
  /** Envelope recipients (RCPT TO) */
  to: string[];
  /** Subject header, decoded */
  subject: string;
  /** Plain-text body, decoded */
  text: string;
  receivedAt: Date;
}

/** RFC 2047 encoded words (`=?UTF-8?Q?...?=` / `=?UTF-8?B?...?=`) as nodemailer writes non-ASCII headers. */
export function decodeEncodedWords(value: string): string {
  // whitespace between two adjacent encoded words is not part of the text (RFC 2047 §6.2)
  const joined = value.replace(/\?=\s+=\?/g, '?==?');
  return joined.replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g, (_m, _charset: string, enc: string, text: string) => {
    if (enc.toUpperCase() === 'B') return Buffer.from(text, 'base64').toString('utf8');
    const bytes = text.replace(/_/g, ' ').replace(/=([0-9A-Fa-f]{2})/g, (_x, hex: string) => `%${hex}`);
    try {
      return decodeURIComponent(bytes);
    } catch {
      return text;
    }
  });
}

/** RFC 2045 §6.7 quoted-printable, UTF-8. */
export function decodeQuotedPrintable(text: string): string {
  const unwrapped = text.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < unwrapped.length; i++) {
    const c = unwrapped[i];
    if (c === '=' && /^[0-9A-Fa-f]{2}$/.test(unwrapped.slice(i + 1, i + 3))) {
      bytes.push(parseInt(unwrapped.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(c, 'utf8'));
    }
  }
  return Buffer.from(bytes).toString('utf8');
}

/**
 * Subject and plain-text body of a single-part message (what the mail service sends). Enough for the demo's
 * outbox check and the tests; not a general MIME parser.
 */
export function parseSimpleMessage(raw: string): { subject: string; text: string } {
  const split = raw.search(/\r?\n\r?\n/);
  const head = split < 0 ? raw : raw.slice(0, split);
  const body = split < 0 ? '' : raw.slice(split).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  const encoding = (headers.get('content-transfer-encoding') ?? '').toLowerCase();
  let text = body;
  if (encoding === 'quoted-printable') text = decodeQuotedPrintable(body);
  else if (encoding === 'base64') text = Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  return { subject: decodeEncodedWords(headers.get('subject') ?? ''), text: text.replace(/\r\n/g, '\n').trimEnd() };
}
