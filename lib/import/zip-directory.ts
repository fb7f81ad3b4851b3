import { crc32, createInflateRaw } from 'node:zlib';
import { IMPORT_LIMITS } from './columns';
import { FileProblem } from './file-problem';

/**
 * A small reader of a ZIP archive's table of contents (APPNOTE.TXT 6.3.x,
 * sections 4.3.6 to 4.3.16), so that an XLSX workbook (a ZIP of XML files) can
 * be judged by what it says it holds before anything is inflated:
 *
 * - the End Of Central Directory record (EOCD, signature 0x06054b50, 22 bytes
 *   plus a comment of up to 65,535 bytes) is the last record of the file; it
 *   gives the number of entries and where the central directory starts;
 * - the central directory holds one header per entry (signature 0x02014b50,
 *   46 bytes plus name, extra field and comment): compression method, CRC-32,
 *   compressed and uncompressed size and the offset of the entry's local header;
 * - each local header (signature 0x04034b50, 30 bytes plus name and extra
 *   field) is followed by the entry's compressed data.
 *
 * Not accepted (no spreadsheet program writes them for a sheet this size):
 * archives split over disks, ZIP64 (sizes or counts that need 64 bits),
 * encryption, and compression other than stored (0) or deflate (8).
 */
export type ZipEntry = {
  name: string;
  flags: number;
  method: number;
  crc32: number;
  compressedSize: number;
  uncompressedSize: number;
  localHeaderOffset: number;
  /** Where the compressed data starts (after the local header). */
  dataOffset: number;
};

const EOCD = 0x06054b50;
const CENTRAL = 0x02014b50;
const LOCAL = 0x04034b50;
const ZIP64_LOCATOR = 0x07064b50;

const unreadable = () => new FileProblem('The file is not a readable XLSX workbook.');
const mb = (n: number) => `${(n / 1048576).toLocaleString('en-US', { maximumFractionDigits: 1 })} MB`;

/** Reads the central directory of `bytes`; throws a FileProblem when it is malformed or uses what is not accepted. */
export function readZipDirectory(bytes: Uint8Array): ZipEntry[] {
  const b = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (b.length < 22) throw unreadable();
  // The EOCD is at the end, before a comment of at most 65,535 bytes: search backwards.
  let eocd = -1;
  for (let i = b.length - 22; i >= Math.max(0, b.length - 22 - 0xffff); i--) {
    if (b.readUInt32LE(i) === EOCD && i + 22 + b.readUInt16LE(i + 20) <= b.length) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw unreadable();
  const disk = b.readUInt16LE(eocd + 4);
  const cdDisk = b.readUInt16LE(eocd + 6);
  const onDisk = b.readUInt16LE(eocd + 8);
  const count = b.readUInt16LE(eocd + 10);
  const cdSize = b.readUInt32LE(eocd + 12);
  const cdOffset = b.readUInt32LE(eocd + 16);
  if (count === 0xffff || cdSize === 0xffffffff || cdOffset === 0xffffffff || (eocd >= 20 && b.readUInt32LE(eocd - 20) === ZIP64_LOCATOR)) {
    throw new FileProblem('The file is a ZIP64 archive, which a fleet sheet never needs; save it again as an ordinary .xlsx workbook.');
  }
  if (disk !== 0 || cdDisk !== 0 || onDisk !== count) throw unreadable();
  if (count > IMPORT_LIMITS.xlsxMaxEntries) {
    throw new FileProblem(`The workbook holds ${count.toLocaleString('en-US')} files; the limit is ${IMPORT_LIMITS.xlsxMaxEntries}. Save only the fleet sheet as a new workbook.`);
  }
  if (cdOffset + cdSize > eocd) throw unreadable();

  const entries: ZipEntry[] = [];
  const names = new Set<string>();
  let p = cdOffset;
  for (let n = 0; n < count; n++) {
    if (p + 46 > cdOffset + cdSize || b.readUInt32LE(p) !== CENTRAL) throw unreadable();
    const flags = b.readUInt16LE(p + 8);
    const method = b.readUInt16LE(p + 10);
    const crc32 = b.readUInt32LE(p + 16);
    const compressedSize = b.readUInt32LE(p + 20);
    const uncompressedSize = b.readUInt32LE(p + 24);
    const nameLength = b.readUInt16LE(p + 28);
    const extraLength = b.readUInt16LE(p + 30);
    const commentLength = b.readUInt16LE(p + 32);
    const localHeaderOffset = b.readUInt32LE(p + 42);
    const end = p + 46 + nameLength + extraLength + commentLength;
    if (end > cdOffset + cdSize) throw unreadable();
    const name = b.toString('utf8', p + 46, p + 46 + nameLength);
    if (compressedSize === 0xffffffff || uncompressedSize === 0xffffffff || localHeaderOffset === 0xffffffff) {
      throw new FileProblem('The file is a ZIP64 archive, which a fleet sheet never needs; save it again as an ordinary .xlsx workbook.');
    }
    if (flags & 0x1) throw new FileProblem('The workbook is encrypted (password-protected); save it again without a password.');
    if (method !== 0 && method !== 8) throw unreadable();
    if (method === 0 && compressedSize !== uncompressedSize) throw unreadable();
    if (names.has(name)) throw unreadable();
    names.add(name);
    // The local header repeats the name; its extra field may differ in length from the central one.
    const lh = localHeaderOffset;
    if (lh + 30 > cdOffset || b.readUInt32LE(lh) !== LOCAL) throw unreadable();
    const dataOffset = lh + 30 + b.readUInt16LE(lh + 26) + b.readUInt16LE(lh + 28);
    if (dataOffset + compressedSize > cdOffset) throw unreadable();
    entries.push({ name, flags, method, crc32, compressedSize, uncompressedSize, localHeaderOffset, dataOffset });
    p = end;
  }
  return entries;
}

/**
 * Refuses an archive whose declared sizes are more than a fleet sheet can need
 * (IMPORT_LIMITS: per entry, in total, and the compression ratio of a large
 * entry). A zip bomb declares its real sizes or lies about them; the lie is
 * caught by `checkInflatedSize` on the entries that are read.
 */
export function checkDeclaredSizes(entries: ZipEntry[]): void {
  const L = IMPORT_LIMITS;
  let total = 0;
  for (const e of entries) {
    if (e.uncompressedSize > L.xlsxMaxEntryBytes) {
      throw new FileProblem(`The workbook part "${e.name}" unpacks to ${mb(e.uncompressedSize)}; the limit is ${mb(L.xlsxMaxEntryBytes)} per part. Save only the fleet sheet as a new workbook.`);
    }
    if (e.uncompressedSize > L.xlsxRatioFloorBytes && e.uncompressedSize / Math.max(1, e.compressedSize) > L.xlsxMaxRatio) {
      const ratio = Math.round(e.uncompressedSize / Math.max(1, e.compressedSize));
      throw new FileProblem(`The workbook part "${e.name}" unpacks ${ratio.toLocaleString('en-US')} times larger than it is stored; the limit is ${L.xlsxMaxRatio} times. The file is not an ordinary spreadsheet.`);
    }
    total += e.uncompressedSize;
  }
  if (total > L.xlsxMaxTotalBytes) {
    throw new FileProblem(`The workbook unpacks to ${mb(total)}; the limit is ${mb(L.xlsxMaxTotalBytes)}. Save only the fleet sheet as a new workbook.`);
  }
}

/** The entry's compressed bytes. */
export function entryData(bytes: Uint8Array, e: ZipEntry): Buffer {
  return Buffer.from(bytes.buffer, bytes.byteOffset + e.dataOffset, e.compressedSize);
}

/**
 * Inflates the entry, counting and discarding what comes out, and refuses it
 * when it inflates past its declared size (a lying header) or does not inflate
 * to exactly that size (a damaged file). Memory stays at zlib's window and one
 * output chunk whatever the data.
 */
export async function checkInflatedSize(bytes: Uint8Array, e: ZipEntry): Promise<void> {
  if (e.method === 0) return; // stored: the size is the size
  const declared = e.uncompressedSize;
  const actual = await new Promise<number>((resolve, reject) => {
    const inflate = createInflateRaw();
    let n = 0;
    let done = false;
    inflate.on('data', (chunk: Buffer) => {
      n += chunk.length;
      if (n > declared && !done) {
        done = true;
        inflate.destroy();
        resolve(n);
      }
    });
    inflate.on('end', () => !done && resolve(n));
    inflate.on('error', () => !done && reject(unreadable()));
    inflate.end(entryData(bytes, e));
  });
  if (actual > declared) {
    throw new FileProblem(`The workbook part "${e.name}" unpacks to more than the ${declared.toLocaleString('en-US')} bytes its header declares. The file is damaged or not an ordinary spreadsheet.`);
  }
  if (actual !== declared) throw unreadable();
}

/** A part to put into a rebuilt archive: an entry of the original, or a small stored part made here. */
export type ZipPart = ZipEntry | { name: string; stored: Buffer };

/**
 * A new archive of only `parts`, in the order given: each a local header with
 * its sizes known (no data descriptor) and the original compressed data, then
 * an empty end record. A streaming reader of it sees exactly the entries that
 * were checked, in the order it needs them.
 */
export function rebuildZip(bytes: Uint8Array, parts: ZipPart[]): Buffer[] {
  const out: Buffer[] = [];
  for (const p of parts) {
    const e =
      'stored' in p
        ? { method: 0, crc32: crc32(p.stored), compressedSize: p.stored.length, uncompressedSize: p.stored.length, data: p.stored }
        : { ...p, data: entryData(bytes, p) };
    const name = Buffer.from(p.name, 'utf8');
    const h = Buffer.alloc(30);
    h.writeUInt32LE(LOCAL, 0);
    h.writeUInt16LE(20, 4); // version needed: 2.0 (deflate)
    h.writeUInt16LE(0x800, 6); // flags: the name is UTF-8
    h.writeUInt16LE(e.method, 8);
    h.writeUInt32LE(e.crc32, 14);
    h.writeUInt32LE(e.compressedSize, 18);
    h.writeUInt32LE(e.uncompressedSize, 22);
    h.writeUInt16LE(name.length, 26);
    out.push(h, name, e.data);
  }
  const end = Buffer.alloc(22);
  end.writeUInt32LE(EOCD, 0);
  out.push(end);
  return out;
}
