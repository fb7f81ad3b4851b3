import 'server-only';
/**
 * Export of a stored business case: the workbook (with the words people typed
 * beside the figures, the ranking and capital plan, the approval stamp) or
 * the Summary CSV. The workbook is evaluated and written in a worker thread
 * and streamed back from a temporary file (workbook-off-thread.ts).
 */
import { fetchApprovalStamp } from '@/lib/approvals/freeze';
import type { Access } from '@/lib/auth/access';
import { evaluateStoredCase, loadValidCase } from '@/lib/cases/evaluate';
import { db } from '@/lib/db';
import { evaluateCaseDetailed } from '@/lib/engine';
import type { EvaluatedCase } from '@/lib/cases/types';
import { summaryCsv } from './csv';
import { FMT } from './cells';
import type { ApprovalStamp, PlanTable, WorkbookMeta } from './types';
import { exportWorkbookOffThread } from './workbook-off-thread';

export type ExportFormat = 'xlsx' | 'csv';

/** Who approved the case, when, and the hash of its frozen record (from the approvals feature). */
async function approvalStamp(workspaceId: number, caseId: number): Promise<ApprovalStamp | null> {
  const owned = await db()('business_cases').where({ id: caseId, workspaceId }).first('id');
  const stamp = owned ? await fetchApprovalStamp(caseId) : null;
  if (!stamp) return null;
  return { approvedBy: stamp.approvedBy.map((a) => (a.name ? `${a.name} <${a.email}>` : a.email)).join(', '), approvedAt: stamp.approvedAt, hash: stamp.hash };
}

function planTables(dto: EvaluatedCase): PlanTable[] {
  const cur = dto.currency;
  const money = { format: FMT.money, width: 16 };
  return [
    {
      title: 'Repower ranking (gain against the better of keep and rebuild)',
      columns: [{ header: 'Rank', width: 8 }, { header: 'Unit' }, { header: 'Measured against' }, { header: `Gain (${cur})`, ...money },
        { header: 'Profitability index', format: FMT.qty2 }, { header: `Capital (${cur})`, ...money }, { header: 'Capital year' }],
      rows: dto.ranking.map((r) => [r.rank, r.truckId, r.bestOther, r.gain, r.profitabilityIndex, r.capital, r.capitalYear]),
    },
    {
      title: 'Capital plan by year (exact: most gain within each year’s budget)',
      columns: [{ header: 'Year', width: 8 }, { header: `Budget (${cur})`, ...money }, { header: 'Chosen', width: 40 },
        { header: `Spent (${cur})`, ...money }, { header: `Gain (${cur})`, ...money }, { header: 'Left out', width: 30 }],
      rows: dto.plan.years.map((y) => [y.year, y.budget, y.chosen.map((c) => c.truckId).join(', '), y.spent, y.gain,
        y.leftOut.map((l) => l.truckId).join(', ')]),
    },
    {
      title: 'Swap schedule within shop capacity',
      columns: [{ header: 'Unit' }, { header: 'Month' }, { header: 'Due' }, { header: 'Capital year' }],
      rows: dto.schedule.map((s) => [s.truckId, s.label, s.dueLabel, s.capitalYear]),
    },
  ];
}

async function wordsBesideFigures(workspaceId: number): Promise<Pick<WorkbookMeta, 'trucks' | 'engines' | 'offers'>> {
  const k = db();
  const [trucks, engines, offers] = await Promise.all([
    k('trucks').where({ workspaceId }).select('unitNumber', 'payloadClass', 'notes'),
    k('engine_types').where({ workspaceId }).select('key', 'name', 'notes'),
    k('repower_offers').where({ workspaceId }).select('key', 'supplier', 'notes'),
  ]);
  return {
    trucks: Object.fromEntries(trucks.map((t) => [t.unitNumber, { payloadClass: t.payloadClass, notes: t.notes }])),
    engines: Object.fromEntries(engines.map((e) => [e.key, { name: e.name, notes: e.notes }])),
    offers: Object.fromEntries(offers.map((o) => [o.key, { supplier: o.supplier, notes: o.notes }])),
  };
}

/** A safe file name from the case name: letters, digits, dash. */
export function exportFileName(name: string, ext: ExportFormat): string {
  const base = name.normalize('NFKD').replace(/[^A-Za-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'case';
  return `${base}.${ext}`;
}

/** The CSV as text; the workbook as a stream of the file written off the request thread, with its size. */
export type CaseExport = { fileName: string } & ({ body: string } | { body: ReadableStream<Uint8Array>; bytes: number });

export async function exportStoredCase(access: Access, id: number, format: ExportFormat): Promise<CaseExport> {
  const { row, file } = await loadValidCase(access, id);
  if (format === 'csv') {
    const { result } = evaluateCaseDetailed(file, { trusted: true });
    return { body: summaryCsv(result, file.currency), fileName: exportFileName(row.name, 'csv') };
  }
  const dto = await evaluateStoredCase(access, id);
  const meta: WorkbookMeta = {
    workspaceName: access.workspace.name,
    status: row.status,
    assumptionSetName: row.assumptionSetName ?? '',
    approval: await approvalStamp(access.workspace.id, id),
    plan: planTables(dto),
    ...(await wordsBesideFigures(access.workspace.id)),
  };
  const { stream, bytes } = await exportWorkbookOffThread(file, meta);
  return { body: stream, bytes, fileName: exportFileName(row.name, 'xlsx') };
}
