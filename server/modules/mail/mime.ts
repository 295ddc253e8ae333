// Just enough MIME reading for the local fake SMTP server to show what it received: headers,
// encoded subjects, multipart bodies, quoted-printable and base64. Not a general mail parser.

export interface ParsedMail {
  headers: Map<string, string>;
  subject: string | null;
  messageId: string | null;
  text: string | null;
  html: string | null;
}

interface Part {
  headers: Map<string, string>;
  body: string;
}

function splitPart(raw: string): Part {
  const normalised = raw.replace(/\r\n/g, '\n');
  const end = normalised.indexOf('\n\n');
  const head = end < 0 ? normalised : normalised.slice(0, end);
  const body = end < 0 ? '' : normalised.slice(end + 2);
  const headers = new Map<string, string>();
  let last: string | null = null;
  for (const line of head.split('\n')) {
    if (/^[ \t]/.test(line) && last) {
      headers.set(last, `${headers.get(last)} ${line.trim()}`);
      continue;
    }
    const colon = line.indexOf(':');
    if (colon <= 0) continue;
    last = line.slice(0, colon).trim().toLowerCase();
    headers.set(last, line.slice(colon + 1).trim());
  }
  return { headers, body };
}

function param(header: string | undefined, name: string): string | null {
  if (!header) return null;
  const m = new RegExp(`${name}\\s*=\\s*(?:"([^"]*)"|([^;\\s]+))`, 'i').exec(header);
  return m ? (m[1] ?? m[2]) : null;
}

function decodeQuotedPrintable(text: string): Buffer {
  const soft = text.replace(/=\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < soft.length; i++) {
    const c = soft[i];
    if (c === '=' && /^[0-9A-Fa-f]{2}$/.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(c, 'utf8'));
    }
  }
  return Buffer.from(bytes);
}

function decodeBody(part: Part): string {
  const encoding = (part.headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  const charset = (param(part.headers.get('content-type'), 'charset') ?? 'utf-8').toLowerCase();
  const bytes = encoding === 'base64' ? Buffer.from(part.body.replace(/\s+/g, ''), 'base64') : encoding === 'quoted-printable' ? decodeQuotedPrintable(part.body) : Buffer.from(part.body, 'utf8');
  return new TextDecoder(charset === 'us-ascii' ? 'utf-8' : charset, { fatal: false }).decode(bytes);
}

/** RFC 2047 encoded words, as nodemailer writes non-ASCII subjects. */
export function decodeHeader(value: string): string {
  return value.replace(/(=\?[^?]+\?[bBqQ]\?[^?]*\?=)\s+(?==\?)/g, '$1').replace(/=\?([^?]+)\?([bBqQ])\?([^?]*)\?=/g, (_m, charset: string, enc: string, data: string) => {
    const bytes = enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64') : decodeQuotedPrintable(data.replace(/_/g, ' '));
    return new TextDecoder(charset.toLowerCase(), { fatal: false }).decode(bytes);
  });
}

function collect(part: Part, out: { text: string | null; html: string | null }) {
  const type = (part.headers.get('content-type') ?? 'text/plain').toLowerCase();
  if (type.startsWith('multipart/')) {
    const boundary = param(part.headers.get('content-type'), 'boundary');
    if (!boundary) return;
    const pieces = part.body.split(`--${boundary}`);
    // The first piece is the preamble and the last one follows the closing boundary.
    for (const piece of pieces.slice(1)) {
      if (piece.startsWith('--')) break;
      collect(splitPart(piece.replace(/^\n/, '')), out);
    }
    return;
  }
  if ((part.headers.get('content-disposition') ?? '').toLowerCase().startsWith('attachment')) return;
  if (type.startsWith('text/html') && out.html === null) out.html = decodeBody(part).replace(/\n$/, '');
  else if (type.startsWith('text/plain') && out.text === null) out.text = decodeBody(part).replace(/\n$/, '');
}

export function parseMail(raw: string): ParsedMail {
  const top = splitPart(raw);
  const out = { text: null as string | null, html: null as string | null };
  collect(top, out);
  const subject = top.headers.get('subject');
  return { headers: top.headers, subject: subject === undefined ? null : decodeHeader(subject), messageId: top.headers.get('message-id') ?? null, text: out.text, html: out.html };
}
