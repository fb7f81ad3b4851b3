/** poppler's pdftotext / pdftoppm on a PDF in memory (Debian's poppler-utils, installed by scripts/install-system-deps.sh). */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { inflateSync } from 'node:zlib';

function withFile<T>(pdf: Buffer, run: (file: string, dir: string) => T): T {
  const dir = mkdtempSync(path.join(tmpdir(), 'pdf-'));
  try {
    const file = path.join(dir, 'in.pdf');
    writeFileSync(file, pdf);
    return run(file, dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The text of every page, in reading order (`-layout` keeps table rows on one line). */
export function pdfToText(pdf: Buffer, layout = true): string {
  return withFile(pdf, (file) => execFileSync('pdftotext', [...(layout ? ['-layout'] : []), file, '-'], { encoding: 'utf8' }));
}

export function pdfPageCount(pdf: Buffer): number {
  return withFile(pdf, (file) => {
    const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
    return Number(/^Pages:\s+(\d+)/m.exec(info)?.[1] ?? 0);
  });
}

/**
 * The first page rendered at 50 dpi by `pdftoppm -png`, decoded: the share of
 * pixels that are not white (0 for a blank page).
 */
export function firstPageInkShare(pdf: Buffer): number {
  return withFile(pdf, (file, dir) => {
    execFileSync('pdftoppm', ['-r', '50', '-png', '-f', '1', '-l', '1', file, path.join(dir, 'page')]);
    const png = readdirSync(dir).find((f) => f.startsWith('page') && f.endsWith('.png'));
    if (!png) throw new Error('pdftoppm wrote no page');
    const { width, height, channels, pixels } = decodePng(readFileSync(path.join(dir, png)));
    let ink = 0;
    for (let i = 0; i < width * height; i++) {
      let white = true;
      for (let c = 0; c < Math.min(3, channels); c++) if (pixels[i * channels + c] < 245) white = false;
      if (!white) ink++;
    }
    return ink / (width * height);
  });
}

/** A minimal PNG decoder for 8-bit grey/RGB/RGBA, non-interlaced (what pdftoppm writes). */
function decodePng(buf: Buffer) {
  let off = 8;
  let width = 0, height = 0, colourType = 0;
  const idat: Buffer[] = [];
  while (off < buf.length) {
    const len = buf.readUInt32BE(off);
    const type = buf.toString('ascii', off + 4, off + 8);
    const data = buf.subarray(off + 8, off + 8 + len);
    if (type === 'IHDR') {
      width = data.readUInt32BE(0);
      height = data.readUInt32BE(4);
      if (data[8] !== 8 || data[12] !== 0) throw new Error('unsupported PNG');
      colourType = data[9];
    } else if (type === 'IDAT') idat.push(data);
    else if (type === 'IEND') break;
    off += 12 + len;
  }
  const channels = ({ 0: 1, 2: 3, 4: 2, 6: 4 } as Record<number, number>)[colourType];
  if (!channels) throw new Error(`unsupported PNG colour type ${colourType}`);
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const pixels = Buffer.alloc(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let x = 0; x < stride; x++) {
      const a = x >= channels ? pixels[y * stride + x - channels] : 0;
      const b = y > 0 ? pixels[(y - 1) * stride + x] : 0;
      const c = x >= channels && y > 0 ? pixels[(y - 1) * stride + x - channels] : 0;
      let v = line[x];
      if (filter === 1) v += a;
      else if (filter === 2) v += b;
      else if (filter === 3) v += (a + b) >> 1;
      else if (filter === 4) {
        const p = a + b - c;
        const pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
        v += pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
      }
      pixels[y * stride + x] = v & 0xff;
    }
  }
  return { width, height, channels, pixels };
}
