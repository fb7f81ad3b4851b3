/**
 * A minimal ZIP writer for tests (APPNOTE.TXT 4.3): local headers with sizes
 * known, a central directory and its end record. A part gives its bytes
 * (deflated here), or deflated data made elsewhere with the sizes to declare,
 * which may differ from the truth: that is how a zip bomb lies.
 */
import { createDeflateRaw, crc32, deflateRawSync } from 'node:zlib';

export type TestZipPart =
  | { name: string; text: string | Buffer }
  | { name: string; deflated: Buffer; declaredSize: number; declaredCompressedSize?: number; crc?: number };

export function writeZip(parts: TestZipPart[]): Uint8Array {
  const locals: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const p of parts) {
    const name = Buffer.from(p.name, 'utf8');
    let data: Buffer;
    let size: number;
    let csize: number;
    let crc: number;
    if ('text' in p) {
      const raw = Buffer.isBuffer(p.text) ? p.text : Buffer.from(p.text, 'utf8');
      data = deflateRawSync(raw);
      size = raw.length;
      csize = data.length;
      crc = crc32(raw);
    } else {
      data = p.deflated;
      size = p.declaredSize;
      csize = p.declaredCompressedSize ?? data.length;
      crc = p.crc ?? 0;
    }
    const lh = Buffer.alloc(30);
    lh.writeUInt32LE(0x04034b50, 0);
    lh.writeUInt16LE(20, 4);
    lh.writeUInt16LE(0x800, 6);
    lh.writeUInt16LE(8, 8);
    lh.writeUInt32LE(crc, 14);
    lh.writeUInt32LE(csize, 18);
    lh.writeUInt32LE(size, 22);
    lh.writeUInt16LE(name.length, 26);
    const ch = Buffer.alloc(46);
    ch.writeUInt32LE(0x02014b50, 0);
    ch.writeUInt16LE(20, 4);
    ch.writeUInt16LE(20, 6);
    ch.writeUInt16LE(0x800, 8);
    ch.writeUInt16LE(8, 10);
    ch.writeUInt32LE(crc, 16);
    ch.writeUInt32LE(csize, 20);
    ch.writeUInt32LE(size, 24);
    ch.writeUInt16LE(name.length, 28);
    ch.writeUInt32LE(offset, 42);
    locals.push(lh, name, data);
    central.push(ch, name);
    offset += lh.length + name.length + data.length;
  }
  const cd = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(parts.length, 8);
  end.writeUInt16LE(parts.length, 10);
  end.writeUInt32LE(cd.length, 12);
  end.writeUInt32LE(offset, 16);
  return new Uint8Array(Buffer.concat([...locals, cd, end]));
}

/** Deflates what `chunks` yields as it goes (never holding it all), giving the deflated bytes, the real size and its CRC-32. */
export async function deflateStreaming(chunks: Iterable<string>): Promise<{ deflated: Buffer; size: number; crc: number }> {
  const z = createDeflateRaw({ level: 9 });
  const out: Buffer[] = [];
  z.on('data', (b: Buffer) => out.push(b));
  const done = new Promise((resolve, reject) => {
    z.on('end', resolve);
    z.on('error', reject);
  });
  let size = 0;
  let crc = 0;
  for (const s of chunks) {
    const b = Buffer.from(s, 'utf8');
    size += b.length;
    crc = crc32(b, crc);
    if (!z.write(b)) await new Promise((r) => z.once('drain', r));
  }
  z.end();
  await done;
  return { deflated: Buffer.concat(out), size, crc };
}

const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const REL = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';

/** The parts of a one-sheet workbook around a sheet part (the sheet itself is given by the caller). */
export function workbookParts(): TestZipPart[] {
  return [
    {
      name: '[Content_Types].xml',
      text: `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/></Types>`,
    },
    {
      name: '_rels/.rels',
      text: `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${REL}/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
    },
    {
      name: 'xl/workbook.xml',
      text: `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="${NS}" xmlns:r="${REL}"><sheets><sheet name="Fleet" sheetId="1" r:id="rId1"/></sheets></workbook>`,
    },
    {
      name: 'xl/_rels/workbook.xml.rels',
      text: `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${REL}/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`,
    },
  ];
}

/**
 * Sheet XML with a header row and `rows` data rows of `cellsPerRow` numbers
 * each (and, with `pad`, an inline text cell of that many spaces, which packs
 * well), yielded about 1 MB at a time.
 */
export function* sheetXml(rows: number, cellsPerRow = 1, pad = 0): Generator<string> {
  const padCell = (r: number) => (pad ? `<c r="ZZ${r}" t="inlineStr"><is><t xml:space="preserve">${' '.repeat(pad)}</t></is></c>` : '');
  yield `<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="${NS}"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>unit_number</t></is></c></row>`;
  let buf = '';
  const letters = (n: number) => {
    let s = '';
    for (n++; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
    return s;
  };
  for (let r = 2; r <= rows + 1; r++) {
    buf += `<row r="${r}">`;
    for (let c = 0; c < cellsPerRow; c++) buf += `<c r="${letters(c)}${r}"><v>${r % 997}</v></c>`;
    buf += `${padCell(r)}</row>`;
    if (buf.length > 1 << 20) {
      yield buf;
      buf = '';
    }
  }
  yield `${buf}</sheetData></worksheet>`;
}

/** A shared-strings part of `count` short strings (`(i % distinct)` in base 36), about 1 MB at a time. */
export function* sharedStringsXml(count: number, distinct: number): Generator<string> {
  yield `<?xml version="1.0" encoding="UTF-8"?><sst xmlns="${NS}" count="${count}" uniqueCount="${count}">`;
  let buf = '';
  for (let i = 0; i < count; i++) {
    buf += `<si><t>${(i % distinct).toString(36)}</t></si>`;
    if (buf.length > 1 << 20) {
      yield buf;
      buf = '';
    }
  }
  yield `${buf}</sst>`;
}

/** A styles part of `formats` cell formats, about 1 MB at a time. */
export function* stylesXml(formats: number): Generator<string> {
  yield `<?xml version="1.0" encoding="UTF-8"?><styleSheet xmlns="${NS}"><fonts count="1"><font><sz val="11"/></font></fonts><fills count="1"><fill><patternFill patternType="none"/></fill></fills><borders count="1"><border/></borders><cellXfs count="${formats}">`;
  let buf = '';
  for (let i = 0; i < formats; i++) {
    buf += `<xf numFmtId="${i % 164}" fontId="0" fillId="0" borderId="0" xfId="0"/>`;
    if (buf.length > 1 << 20) {
      yield buf;
      buf = '';
    }
  }
  yield `${buf}</cellXfs></styleSheet>`;
}
