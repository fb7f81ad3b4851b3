/**
 * The workbook export off the request thread (lib/export/workbook-off-thread.ts):
 * the worker writes the workbook the request thread writes, cell for cell;
 * the file it streams back is removed once read; without the bundle the
 * export runs on the thread and says so once.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { evaluateCaseDetailed } from '@/lib/engine/evaluate';
import { validateCase, type CaseFile } from '@/lib/validation/case';
import { bundleForNode } from '@/lib/risk/build-worker';
import { exportWorkbookOffThread } from '@/lib/export/workbook-off-thread';
import { workbookWorkerStarts } from '@/lib/export/workbook-pool';
import { writeWorkbookBuffer } from '@/lib/export/workbook';
import type { WorkbookMeta } from '@/lib/export/types';

const root = path.resolve(__dirname, '../..');
const v = validateCase(JSON.parse(readFileSync(path.join(root, 'scenarios/aldervane-north-pit.json'), 'utf8')));
if (!v.ok) throw new Error('demo case invalid');
const demo = v.value as CaseFile;
const meta: WorkbookMeta = { workspaceName: 'North pit', status: 'draft', generatedAt: new Date('2026-12-01T08:00:00Z') };
let bundle = '';

beforeAll(async () => {
  const out = path.join(mkdtempSync(path.join(os.tmpdir(), 'haulcase-wb-worker-')), 'workbook-worker.cjs');
  bundle = await bundleForNode(path.join(root, 'lib/export/workbook-entry.ts'), out, root);
}, 120_000);

afterEach(() => {
  vi.restoreAllMocks();
});

/** Every cell of every sheet: its address, value (formula and cached result) and number format. */
async function cellsOf(bytes: Buffer): Promise<string[]> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  const out: string[] = [];
  wb.eachSheet((ws) =>
    ws.eachRow((row) => row.eachCell((c) => out.push(`${ws.name}!${c.address} ${JSON.stringify(c.value)} ${c.numFmt ?? ''}`))),
  );
  return out;
}

const exportFolders = () => readdirSync(os.tmpdir()).filter((f) => f.startsWith('haulcase-export-'));

async function read(stream: ReadableStream<Uint8Array>): Promise<Buffer> {
  return Buffer.from(await new Response(stream).arrayBuffer());
}

describe('workbook export off the request thread', () => {
  it('writes in a worker the workbook the request thread writes, and removes its file once read', async () => {
    process.env.HAULCASE_EXPORT_WORKER = bundle;
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined);
    const before = new Set(exportFolders());
    const file = await exportWorkbookOffThread(demo, meta);
    expect(warn).not.toHaveBeenCalled(); // the worker wrote it
    const made = exportFolders().filter((f) => !before.has(f));
    expect(made).toHaveLength(1);
    const bytes = await read(file.stream);
    expect(bytes.length).toBe(file.bytes);
    const direct = await writeWorkbookBuffer({ caseFile: demo, evaluated: evaluateCaseDetailed(demo, { trusted: true }), meta });
    const [off, on] = await Promise.all([cellsOf(bytes), cellsOf(direct)]);
    expect(off.length).toBeGreaterThan(50_000);
    expect(off).toEqual(on);
    await vi.waitFor(() => expect(existsSync(path.join(os.tmpdir(), made[0]))).toBe(false));
  }, 120_000);

  it('keeps its worker thread for the next export', async () => {
    process.env.HAULCASE_EXPORT_WORKER = bundle;
    const started = workbookWorkerStarts();
    const [a, b] = await Promise.all([exportWorkbookOffThread(demo, meta), exportWorkbookOffThread(demo, { ...meta, workspaceName: 'South pit' })]);
    const [bytesA, bytesB] = await Promise.all([read(a.stream), read(b.stream)]);
    const cover = async (bytes: Buffer) => (await cellsOf(bytes)).filter((c) => c.startsWith('Cover!B4 '));
    expect(await cover(bytesA)).toEqual(['Cover!B4 "North pit" @']);
    expect(await cover(bytesB)).toEqual(['Cover!B4 "South pit" @']);
    expect(workbookWorkerStarts()).toBe(started); // the thread of the export before
  }, 120_000);

  it('without the bundle writes on the request thread and says so once', async () => {
    process.env.HAULCASE_EXPORT_WORKER = path.join(os.tmpdir(), 'no-such-folder', 'workbook-worker.cjs');
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined);
    const first = await exportWorkbookOffThread(demo, meta);
    const second = await exportWorkbookOffThread(demo, meta);
    const [a, b] = await Promise.all([read(first.stream), read(second.stream)]);
    expect(a.length).toBe(first.bytes);
    expect(await cellsOf(a)).toEqual(await cellsOf(b));
    expect(warn).toHaveBeenCalledTimes(1);
    expect(String(warn.mock.calls[0][0])).toMatch(/no worker bundle at .*no-such-folder.*writing on the request thread/);
  }, 120_000);
});
