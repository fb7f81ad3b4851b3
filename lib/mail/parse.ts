/**
 * Just enough MIME to read what nodemailer sends: headers (folded lines,
 * RFC 2047 encoded words), nested multipart bodies, quoted-printable and
 * base64 parts, UTF-8 text. Not a general mail parser: the sink only ever
 * receives our own messages.
 */
export type ParsedMail = { headers: Record<string, string>; subject: string; from: string; text: string; html: string };

function splitHeadBody(raw: string): [string, string] {
  const i = raw.search(/\r?\n\r?\n/);
  if (i < 0) return [raw, ''];
  const sep = raw.slice(i).match(/^\r?\n\r?\n/)![0];
  return [raw.slice(0, i), raw.slice(i + sep.length)];
}

function parseHeaders(head: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const c = line.indexOf(':');
    if (c > 0) out[line.slice(0, c).trim().toLowerCase()] = line.slice(c + 1).trim();
  }
  return out;
}

export function decodeWords(s: string): string {
  return s
    .replace(/(=\?[^?]+\?[bqBQ]\?[^?]*\?=)\s+(?==\?)/g, '$1')
    .replace(/=\?([^?]+)\?([bqBQ])\?([^?]*)\?=/g, (_m, _cs, enc: string, data: string) => {
      const bytes = enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64') : qpBytes(data.replace(/_/g, ' '));
      return bytes.toString('utf8');
    });
}

function qpBytes(s: string): Buffer {
  const soft = s.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < soft.length; i++) {
    if (soft[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(soft[i], 'utf8'));
    }
  }
  return Buffer.from(bytes);
}

function decodeBody(body: string, encoding: string | undefined): string {
  const enc = (encoding ?? '7bit').toLowerCase();
  if (enc === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  if (enc === 'quoted-printable') return qpBytes(body).toString('utf8');
  return body;
}

function walk(raw: string, into: { text: string; html: string }): Record<string, string> {
  const [head, body] = splitHeadBody(raw);
  const headers = parseHeaders(head);
  const type = headers['content-type'] ?? 'text/plain';
  const boundary = type.match(/boundary="?([^";]+)"?/i)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    const parts = body.split(new RegExp(`\\r?\\n?--${boundary.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}(?:--)?[ \\t]*\\r?\\n?`));
    for (const part of parts.slice(1)) if (part.trim()) walk(part, into);
  } else if (/^text\/html/i.test(type)) {
    into.html ||= decodeBody(body, headers['content-transfer-encoding']);
  } else if (/^text\/plain/i.test(type)) {
    into.text ||= decodeBody(body, headers['content-transfer-encoding']);
  }
  return headers;
}

export function parseMail(raw: string): ParsedMail {
  const parts = { text: '', html: '' };
  const headers = walk(raw, parts);
  return { headers, subject: decodeWords(headers.subject ?? ''), from: decodeWords(headers.from ?? ''), text: parts.text.trimEnd(), html: parts.html.trimEnd() };
}
