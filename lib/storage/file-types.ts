import { stripControlCharacters } from '@/lib/validation/control-characters';

/** Limits for quote documents. */
export const DOCUMENT_MAX_BYTES = 10 * 1024 * 1024;

export type DocumentType = { contentType: string; label: string };

const startsWith = (b: Uint8Array, sig: number[], at = 0) => sig.every((x, i) => b[at + i] === x);
const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));

/**
 * The type a file really is, read from its first bytes (the extension and the
 * browser's content type are the sender's claims, not facts). null: not allowed.
 */
export function sniffDocumentType(b: Uint8Array): DocumentType | null {
  if (startsWith(b, ascii('%PDF-'))) return { contentType: 'application/pdf', label: 'PDF' };
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { contentType: 'image/png', label: 'PNG' };
  if (startsWith(b, [0xff, 0xd8, 0xff])) return { contentType: 'image/jpeg', label: 'JPEG' };
  if (startsWith(b, ascii('RIFF')) && startsWith(b, ascii('WEBP'), 8)) return { contentType: 'image/webp', label: 'WebP' };
  return null;
}

/**
 * A file name safe to store, show and send back in Content-Disposition: no
 * folder, no quotes, no control or bidirectional characters (which would show
 * "quote\u202Efdp.exe" as "quoteexe.pdf").
 */
export function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  const cleaned = stripControlCharacters(base).replace(/"/g, '').trim().slice(0, 200);
  return cleaned || 'document';
}
