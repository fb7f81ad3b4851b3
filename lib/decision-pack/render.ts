/**
 * The decision pack: an A4 PDF of a case's proposal, drawn with pdfkit's text
 * and vector primitives (no browser). A pure function of a `DecisionPackData`
 * and the font files: the same data gives the same pages.
 *
 * Order: title block, decision summary, fleet chart of capital and cash flow by
 * fiscal year, the ranking with the proposal marked, the swap schedule, the
 * risk summary, key assumptions, the approval trail with the frozen hash, and
 * the safety caution. Every page carries a footer with the case, the date
 * made and "page n of m".
 */
import PDFDocument from 'pdfkit';
import { VALUATION_LABEL } from '@/lib/cases/valuation';
import { formatNumber } from '@/lib/format';
import { fiscalYearLabel, MAX_TABLE_ROWS, moneyK, niceTicks, pdfText, percent, tableBreaks, years, type PackFont } from './layout';
import type { DecisionPackData } from './types';

/** The pack's fonts (IBM Plex Sans, any format pdfkit's fontkit reads: TTF, WOFF, WOFF2); null: the built-in Helvetica. */
export type PackFonts = { regular: Buffer; bold: Buffer } | null;

const COLOUR = { ink: '#15181c', muted: '#5d646d', rule: '#e3e4e1', accent: '#35618f', repower: '#b0562b', gain: '#2e7650', loss: '#b3261e', caution: '#8a5a00', cautionGround: '#fdf6e3', cautionRule: '#ecd9a8', band: '#f3f1ec' };

export const PAGE = { width: 595.28, height: 841.89, left: 50, right: 50, top: 56, bottom: 64 } as const;
const CONTENT_WIDTH = PAGE.width - PAGE.left - PAGE.right;
const BOTTOM = PAGE.height - PAGE.bottom;
export const ROW_HEIGHT = 14;
export const HEADER_HEIGHT = 18;

export const SAFETY_CAUTION =
  'Caution. These figures inform capital decisions; they do not certify an engine installation. Engine swaps, electrical work and load testing on haul trucks follow the manufacturer’s procedures, site safety rules and local codes, and are done by licensed, qualified people.';

const SOURCE_LINE: Record<DecisionPackData['summary']['source'], string> = {
  frozen: 'Figures from the frozen record stored at approval.',
  submitted: 'Figures from the snapshot taken at submission (later edits to the fleet do not reach them).',
  live: 'Figures from the live fleet data (a draft: they change as the data changes).',
};

const NO_RUN: Record<DecisionPackData['summary']['source'], string> = {
  live: 'No pinned Monte Carlo run: no run is pinned to this case yet.',
  submitted: 'No pinned run: submitted without a pinned Monte Carlo run.',
  frozen: 'No pinned run: approved without a pinned Monte Carlo run.',
};

const ACTION_LABEL: Record<string, string> = { submit: 'Submitted', approve: 'Approved', reject: 'Rejected', return: 'Sent back', revision: 'Revision created' };

type Column = { label: string; width: number; align?: 'left' | 'right' };

export function renderDecisionPack(data: DecisionPackData, fonts: PackFonts): Promise<Buffer> {
  const fontKind: PackFont = fonts ? 'plex' : 'helvetica';
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: PAGE.top, bottom: PAGE.bottom, left: PAGE.left, right: PAGE.right },
    bufferPages: true,
    // the default font is ours, so pdfkit never reads its own font metrics files
    font: (fonts ? fonts.regular : 'Helvetica') as unknown as string,
    info: { Title: `${data.summary.caseName} decision pack`, Author: 'Haulcase', Subject: `Decision pack of ${data.summary.caseName} (${data.workspaceName})` },
  });
  if (fonts) {
    doc.registerFont('regular', fonts.regular);
    doc.registerFont('bold', fonts.bold);
  } else {
    doc.registerFont('regular', 'Helvetica');
    doc.registerFont('bold', 'Helvetica-Bold');
  }
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const s = data.summary;
  const neg = data.negativeStyle;
  const cur = s.currency;
  const t = (x: string) => pdfText(x, fontKind);
  const k = (x: number | null | undefined) => t(moneyK(x, neg));

  const ensure = (h: number) => {
    if (doc.y + h > BOTTOM) doc.addPage();
  };
  const heading = (title: string, room = 60) => {
    ensure(room);
    doc.moveDown(0.8);
    doc.font('bold').fontSize(12.5).fillColor(COLOUR.ink).text(t(title), PAGE.left, doc.y, { width: CONTENT_WIDTH });
    const y = doc.y + 2;
    doc.moveTo(PAGE.left, y).lineTo(PAGE.left + CONTENT_WIDTH, y).lineWidth(0.6).strokeColor(COLOUR.rule).stroke();
    doc.y = y + 6;
  };
  const para = (text: string, opts: { size?: number; colour?: string; bold?: boolean } = {}) => {
    doc.font(opts.bold ? 'bold' : 'regular').fontSize(opts.size ?? 9.5).fillColor(opts.colour ?? COLOUR.ink);
    ensure(doc.heightOfString(t(text), { width: CONTENT_WIDTH }) + 2);
    doc.text(t(text), PAGE.left, doc.y, { width: CONTENT_WIDTH });
    doc.moveDown(0.3);
  };
  /** label–value pairs in two columns of pairs */
  const facts = (pairs: Array<[string, string]>, labelWidth = 150) => {
    doc.fontSize(9.5);
    const colW = CONTENT_WIDTH / 2;
    for (let i = 0; i < pairs.length; i += 2) {
      ensure(ROW_HEIGHT + 2);
      const y = doc.y;
      let h = ROW_HEIGHT;
      pairs.slice(i, i + 2).forEach(([label, value], j) => {
        const x = PAGE.left + j * colW;
        doc.font('regular').fillColor(COLOUR.muted).text(t(label), x, y, { width: labelWidth - 6 });
        const lh = doc.y - y;
        doc.font('bold').fillColor(COLOUR.ink).text(t(value), x + labelWidth, y, { width: colW - labelWidth - 8 });
        h = Math.max(h, lh, doc.y - y);
      });
      doc.y = y + h + 2;
    }
  };
  /** a table whose rows never split and whose header repeats on every page it runs onto */
  const table = (columns: Column[], rows: string[][], opts: { mark?: (i: number) => boolean; bold?: (i: number) => boolean } = {}) => {
    const scale = CONTENT_WIDTH / columns.reduce((a, c) => a + c.width, 0);
    const cols = columns.map((c) => ({ ...c, width: c.width * scale }));
    const drawHeader = () => {
      const y = doc.y;
      doc.rect(PAGE.left, y, CONTENT_WIDTH, HEADER_HEIGHT).fill(COLOUR.band);
      let x = PAGE.left;
      doc.font('bold').fontSize(8).fillColor(COLOUR.muted);
      for (const c of cols) {
        doc.text(t(c.label), x + 3, y + 5, { width: c.width - 6, align: c.align ?? 'left', lineBreak: false, ellipsis: true, height: HEADER_HEIGHT });
        x += c.width;
      }
      doc.y = y + HEADER_HEIGHT;
    };
    const breaks = new Set(tableBreaks(rows.length, { startY: doc.y, top: PAGE.top, bottom: BOTTOM, rowHeight: ROW_HEIGHT, headerHeight: HEADER_HEIGHT }));
    if (!breaks.has(0)) drawHeader();
    rows.forEach((row, i) => {
      if (breaks.has(i)) {
        doc.addPage();
        drawHeader();
      }
      const y = doc.y;
      if (opts.mark?.(i)) {
        doc.rect(PAGE.left, y, CONTENT_WIDTH, ROW_HEIGHT).fill('#f8ece5');
        doc.rect(PAGE.left, y, 2.5, ROW_HEIGHT).fill(COLOUR.repower);
      }
      let x = PAGE.left;
      doc.font(opts.bold?.(i) ? 'bold' : 'regular').fontSize(8.5).fillColor(COLOUR.ink);
      row.forEach((cell, j) => {
        const c = cols[j];
        doc.text(t(cell), x + 4, y + 3.5, { width: c.width - 7, align: c.align ?? 'left', lineBreak: false, ellipsis: true, height: ROW_HEIGHT });
        x += c.width;
      });
      doc.moveTo(PAGE.left, y + ROW_HEIGHT).lineTo(PAGE.left + CONTENT_WIDTH, y + ROW_HEIGHT).lineWidth(0.4).strokeColor(COLOUR.rule).stroke();
      doc.y = y + ROW_HEIGHT;
    });
    doc.x = PAGE.left;
    doc.moveDown(0.4);
  };
  const more = (shown: number, total: number, what: string) => {
    if (total > shown) para(`… and ${formatNumber(total - shown)} more ${what} (the full list is in the workbook).`, { size: 8.5, colour: COLOUR.muted });
  };

  // ------------------------------------------------------------ title block
  doc.font('bold').fontSize(8.5).fillColor(COLOUR.repower).text('HAULCASE · DECISION PACK', PAGE.left, PAGE.top);
  doc.moveDown(0.4);
  doc.font('bold').fontSize(20).fillColor(COLOUR.ink).text(t(s.caseName), { width: CONTENT_WIDTH });
  doc.moveDown(0.4);
  facts(
    [
      ['Workspace', data.workspaceName],
      ['Status', s.status[0].toUpperCase() + s.status.slice(1)],
      ['Valuation', VALUATION_LABEL[s.valuation]],
      ['Assumption set', data.assumptionSetName ?? '—'],
      ['Date', `${data.generatedAt.slice(0, 16).replace('T', ' ')} UTC`],
      ['Currency', `${cur} (figures in ${cur} k unless marked)`],
    ],
    80,
  );
  para(SOURCE_LINE[s.source], { size: 8.5, colour: COLOUR.muted });

  // ------------------------------------------------------------ decision summary
  heading('Decision summary');
  const risk = s.risk;
  facts([
    [`Capital asked (${cur} k)`, k(s.totalCapital)],
    [`Trucks repowered`, formatNumber(s.chosenTrucks.length)],
    [`Gain vs rebuilding every engine (${cur} k)`, k(s.gainVsRebuildAll)],
    [`Gain vs the unconstrained best mix (${cur} k)`, k(s.gainVsBestMix)],
    ['IRR', percent(s.irr)],
    ['MIRR', percent(s.mirr)],
    ['Payback', years(s.payback)],
    ['Discounted payback', years(s.discountedPayback)],
    ['Fuel saved (kL/yr)', formatNumber(s.fuelSavedLitresPerYear / 1000, 0)],
    ['CO2 saved (t/yr)', formatNumber(s.co2SavedTonnesPerYear, 0)],
    ['Chance of losing money', risk ? percent(risk.probabilityOfLoss) : 'no pinned run'],
    [`P10 / P50 / P90 (${cur} k)`, risk ? `${k(risk.p10)} / ${k(risk.p50)} / ${k(risk.p90)}` : '—'],
  ]);
  para(
    `Comparisons (not the proposal): the unconstrained best mix gains ${k(s.bestMixGain)} k and repowering every truck ${k(s.repowerAllGain)} k against rebuilding every engine.`,
    { size: 8.5, colour: COLOUR.muted },
  );
  doc.moveDown(0.3);
  para('Capital asked by fiscal year', { bold: true, size: 10 });
  table(
    [{ label: 'Fiscal year', width: 80 }, { label: `Budget (${cur} k)`, width: 90, align: 'right' }, { label: `Capital asked (${cur} k)`, width: 100, align: 'right' }, { label: 'Trucks repowered', width: 230 }],
    [
      ...s.capitalByFiscalYear.map((y) => [fiscalYearLabel(y.fiscalYear), y.budget === null ? 'no limit' : k(y.budget), k(y.capital), y.trucks.join(', ') || '—']),
      ['Total', '', k(s.totalCapital), formatNumber(s.chosenTrucks.length) + ' trucks'],
    ],
    { bold: (i) => i === s.capitalByFiscalYear.length },
  );
  para('Left out of the proposal', { bold: true, size: 10 });
  if (s.leftOut.length === 0) para('No truck worth repowering is left out.', { size: 9 });
  else {
    const shown = s.leftOut.slice(0, MAX_TABLE_ROWS);
    table(
      [{ label: 'Truck', width: 70 }, { label: `Capital (${cur} k)`, width: 85, align: 'right' }, { label: `Gain forgone (${cur} k)`, width: 95, align: 'right' }, { label: `Extra budget to add it (${cur} k)`, width: 115, align: 'right' }, { label: 'Why', width: 135 }],
      shown.map((l) => [l.truckId, k(l.capital), k(l.gainForgone), k(l.extraBudget), l.reason]),
    );
    more(shown.length, s.leftOut.length, 'trucks left out');
  }
  if (s.notWorthIt.length) para(`Not proposed because the repower does not pay against the truck’s better other policy: ${s.notWorthIt.join(', ')}.`, { size: 8.5, colour: COLOUR.muted });
  para(`What swings the proposal’s gain most (each driver ±20 %, ${cur} k)`, { bold: true, size: 10 });
  if (s.topDrivers.length === 0) para('Not computed.', { size: 9 });
  else
    table(
      [{ label: 'Driver', width: 170 }, { label: 'Low – high value', width: 110, align: 'right' }, { label: 'Gain at low', width: 75, align: 'right' }, { label: 'Gain at high', width: 75, align: 'right' }, { label: 'Swing', width: 70, align: 'right' }],
      s.topDrivers.map((d) => [d.label, `${formatNumber(d.driverLow, 2)} – ${formatNumber(d.driverHigh, 2)}${d.unit ? ` ${d.unit}` : ''}`, k(d.low), k(d.high), k(d.swing)]),
    );

  // ------------------------------------------------------------ fleet chart
  heading('Capital and cash flow by fiscal year', 260);
  drawChart(doc, data, t, doc.y);

  // ------------------------------------------------------------ ranking
  heading('Ranking, with the proposal marked');
  para('Trucks by the gain of repowering against their better other policy. Marked rows (shaded, “yes”) are repowered in the proposal.', { size: 8.5, colour: COLOUR.muted });
  const ranking = data.ranking.slice(0, MAX_TABLE_ROWS);
  table(
    [
      { label: 'Rank', width: 34, align: 'right' },
      { label: 'Truck', width: 62 },
      { label: 'In proposal', width: 56 },
      { label: 'Policy', width: 56 },
      { label: `Gain (${cur} k)`, width: 76, align: 'right' },
      { label: 'PI', width: 40, align: 'right' },
      { label: `Capital (${cur} k)`, width: 76, align: 'right' },
      { label: 'Fiscal year', width: 60 },
    ],
    ranking.map((r) => [String(r.rank), r.truckId, r.inProposal ? 'yes' : '', r.policy, k(r.gain), r.profitabilityIndex === null ? '—' : formatNumber(r.profitabilityIndex, 2), k(r.capital), fiscalYearLabel(r.fiscalYear)]),
    { mark: (i) => ranking[i].inProposal },
  );
  more(ranking.length, data.ranking.length, 'trucks');

  // ------------------------------------------------------------ schedule
  heading('Swap schedule');
  para(`At most ${data.shopCapacityPerMonth} swap${data.shopCapacityPerMonth === 1 ? '' : 's'} a month (shop capacity).`, { size: 8.5, colour: COLOUR.muted });
  if (data.schedule.length === 0) para('No swap is scheduled: the proposal repowers no truck.', { size: 9 });
  else {
    const swaps = data.schedule.slice(0, MAX_TABLE_ROWS);
    table(
      [{ label: 'Month', width: 80 }, { label: 'Truck', width: 80 }, { label: 'Engine due', width: 80 }, { label: 'Fiscal year', width: 70 }, { label: 'Note', width: 190 }],
      swaps.map((w) => [w.month, w.truckId, w.due, fiscalYearLabel(w.fiscalYear), w.late ? 'late: no earlier month had room' : w.movedEarlier ? 'moved earlier for shop capacity' : '']),
    );
    more(swaps.length, data.schedule.length, 'swaps');
  }

  // ------------------------------------------------------------ risk
  heading('Risk summary');
  if (!risk) para(NO_RUN[s.source], { size: 9.5 });
  else {
    para(risk.label, { size: 9.5, bold: true });
    facts([
      ['Monte Carlo run', risk.runId.slice(0, 8)],
      ['Iterations', formatNumber(risk.iterations)],
      ['Seed', String(risk.seed)],
      ['Engine failures sampled', risk.sampleFailures ? 'yes' : 'no'],
      ['Run by', risk.author],
      ['Finished', `${risk.finishedAt.slice(0, 16).replace('T', ' ')} UTC`],
      ['Chance of losing money', percent(risk.probabilityOfLoss)],
      [`P10 (${cur} k)`, k(risk.p10)],
      [`P50 (${cur} k)`, k(risk.p50)],
      [`P90 (${cur} k)`, k(risk.p90)],
    ]);
  }

  // ------------------------------------------------------------ plan against actual
  const act = data.actuals;
  if (act) {
    heading('Plan against actual');
    const v = (a: number, b: number) => (b > 0 ? a / b - 1 : null);
    const sp = (x: number | null) => (x === null ? '—' : `${x > 0 ? '+' : ''}${percent(x)}`);
    para(
      `Readings ${act.from} to ${act.to} against the approved forecast under the proposal's policy per truck. Saving: what rebuilding would have cost on the actual hours minus what the proposal cost (actual fuel at the case's prices, capital spent, other costs at the case's rate an hour). Flags: hours or burn beyond ± ${formatNumber(act.tolerancePercent, 1)} %.`,
      { size: 8.5, colour: COLOUR.muted },
    );
    const f = act.fleet;
    table(
      [{ label: 'Fleet', width: 200 }, { label: 'Actual', width: 100, align: 'right' }, { label: 'Case', width: 100, align: 'right' }, { label: 'Variance', width: 80, align: 'right' }],
      [
        ['Operating hours (h)', formatNumber(f.hours), formatNumber(f.forecastHours), sp(v(f.hours, f.forecastHours))],
        ['Fuel burned (L)', formatNumber(f.litres), formatNumber(f.expectedLitres), sp(v(f.litres, f.expectedLitres))],
        ['Days down', formatNumber(f.daysDown, 1), formatNumber(f.expectedDaysDown, 1), sp(v(f.daysDown, f.expectedDaysDown))],
        [`Capital spent (${cur} k)`, k(f.capital), k(f.plannedCapital), sp(v(f.capital, f.plannedCapital))],
        [`Saving against rebuilding (${cur} k)`, k(f.saving), k(f.forecastSaving), ''],
      ],
    );
    const rows = act.trucks.slice(0, MAX_TABLE_ROWS);
    table(
      [
        { label: 'Truck', width: 70 }, { label: 'Policy', width: 60 }, { label: 'Hours var.', width: 70, align: 'right' }, { label: 'Burn var.', width: 70, align: 'right' },
        { label: `Saving (${cur} k)`, width: 80, align: 'right' }, { label: `Forecast (${cur} k)`, width: 80, align: 'right' }, { label: 'Flags', width: 70 },
      ],
      rows.map((r) => [r.unit, r.policy, sp(r.hoursVariance), sp(r.burnVariance), k(r.saving), k(r.forecastSaving), r.flags.join(', ')]),
      { mark: (i) => rows[i].flags.length > 0 },
    );
    more(rows.length, act.trucks.length, 'trucks');
  }

  // ------------------------------------------------------------ assumptions
  heading('Key assumptions');
  facts(data.assumptions.map((a) => [a.label, a.value] as [string, string]));

  // ------------------------------------------------------------ approval trail
  heading('Approval trail');
  para(`${data.approvalsRequired} approval${data.approvalsRequired === 1 ? '' : 's'} required.`, { size: 8.5, colour: COLOUR.muted });
  if (data.trail.length === 0) para('Not submitted yet.', { size: 9 });
  else
    table(
      [{ label: 'When (UTC)', width: 90 }, { label: 'Who', width: 110 }, { label: 'What', width: 80 }, { label: 'Comment', width: 220 }],
      data.trail.map((e) => [e.at.slice(0, 16).replace('T', ' '), e.who, ACTION_LABEL[e.action] ?? e.action, e.comment]),
    );
  if (data.frozen) {
    para('Frozen record (SHA-256)', { bold: true, size: 10 });
    para(data.frozen.hash, { size: 9 });
    para(
      data.frozen.verifies
        ? 'The stored record verifies against this hash. Download the frozen record from the approval page and recompute it with: sha256sum <file> (or shasum -a 256 <file>).'
        : 'WARNING: the stored record does not verify against this hash.',
      { size: 8.5, colour: data.frozen.verifies ? COLOUR.muted : COLOUR.loss },
    );
  } else para('No frozen record yet: the case is frozen at its final approval.', { size: 9 });

  // ------------------------------------------------------------ caution
  doc.font('regular').fontSize(8.5);
  const cautionH = doc.heightOfString(t(SAFETY_CAUTION), { width: CONTENT_WIDTH - 16 }) + 12;
  ensure(cautionH + 16);
  doc.moveDown(0.8);
  const cy = doc.y;
  doc.rect(PAGE.left, cy, CONTENT_WIDTH, cautionH).fillAndStroke(COLOUR.cautionGround, COLOUR.cautionRule);
  doc.fillColor(COLOUR.caution).text(t(SAFETY_CAUTION), PAGE.left + 8, cy + 6, { width: CONTENT_WIDTH - 16 });

  // ------------------------------------------------------------ footers
  const range = doc.bufferedPageRange();
  const made = data.generatedAt.slice(0, 10);
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const y = PAGE.height - PAGE.bottom + 22;
    doc.moveTo(PAGE.left, y - 6).lineTo(PAGE.left + CONTENT_WIDTH, y - 6).lineWidth(0.4).strokeColor(COLOUR.rule).stroke();
    doc.font('regular').fontSize(7.5).fillColor(COLOUR.muted);
    // writing below the bottom margin must not add a page
    const footer = t(`${s.caseName} · ${data.workspaceName} · decision pack made ${made}`);
    doc.text(footer, PAGE.left, y, { width: CONTENT_WIDTH - 70, lineBreak: false, ellipsis: true, height: 10 });
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, PAGE.left + CONTENT_WIDTH - 70, y, { width: 70, align: 'right', lineBreak: false, height: 10 });
  }
  doc.end();
  return done;
}

/** Bars of capital asked (down, as spend) and of the proposal's net cash flow against rebuilding every engine, by fiscal year. */
function drawChart(doc: PDFKit.PDFDocument, data: DecisionPackData, t: (s: string) => string, top: number) {
  const cur = data.summary.currency;
  const years = data.chart;
  const height = 220;
  const plotLeft = PAGE.left + 52;
  const plotRight = PAGE.left + CONTENT_WIDTH - 4;
  doc.font('regular').fontSize(8).fillColor(COLOUR.muted);
  doc.text(t(`${cur} k. Capital is drawn as spend (below zero) in the years the engine's trace spends it (the summary above books each repower's capital in the year of its first spend); cash flow is the proposal’s net cash flow against rebuilding every engine, after tax, undiscounted.`), PAGE.left, top, { width: CONTENT_WIDTH });
  const plotTop = doc.y + 10;
  const plotBottom = top + height - 26;
  if (years.length === 0) {
    doc.y = top + 30;
    doc.font('regular').fontSize(9).fillColor(COLOUR.ink).text('No fiscal year to chart.', PAGE.left, doc.y);
    return;
  }
  const values = years.flatMap((y) => [-y.capital / 1000, y.cashFlow / 1000]);
  const ticks = niceTicks(Math.min(...values), Math.max(...values), 5);
  const lo = ticks[0];
  const hi = ticks[ticks.length - 1];
  const yOf = (v: number) => plotBottom - ((v - lo) / (hi - lo)) * (plotBottom - plotTop);
  // grid and axis labels
  doc.lineWidth(0.4);
  for (const v of ticks) {
    const y = yOf(v);
    doc.moveTo(plotLeft, y).lineTo(plotRight, y).strokeColor(v === 0 ? COLOUR.ink : COLOUR.rule).lineWidth(v === 0 ? 0.8 : 0.4).stroke();
    doc.font('regular').fontSize(7.5).fillColor(COLOUR.muted).text(t(formatNumber(v, 0, data.negativeStyle)), PAGE.left, y - 4, { width: 46, align: 'right', lineBreak: false });
  }
  const slot = (plotRight - plotLeft) / years.length;
  const bar = Math.min(22, slot * 0.32);
  years.forEach((y, i) => {
    const cx = plotLeft + slot * (i + 0.5);
    const cap = -y.capital / 1000;
    const cf = y.cashFlow / 1000;
    const z = yOf(0);
    if (Math.abs(cap) > 1e-9) doc.rect(cx - bar - 1, Math.min(z, yOf(cap)), bar, Math.abs(yOf(cap) - z)).fill(COLOUR.repower);
    if (Math.abs(cf) > 1e-9) doc.rect(cx + 1, Math.min(z, yOf(cf)), bar, Math.abs(yOf(cf) - z)).fill(cf >= 0 ? COLOUR.gain : COLOUR.loss);
    // label every year when they fit, else every n-th
    const every = Math.ceil(years.length / Math.max(1, Math.floor((plotRight - plotLeft) / 38)));
    if (i % every === 0) doc.font('regular').fontSize(7.5).fillColor(COLOUR.ink).text(fiscalYearLabel(y.fiscalYear), cx - 20, plotBottom + 4, { width: 40, align: 'center', lineBreak: false });
  });
  // legend
  const ly = plotBottom + 16;
  doc.rect(plotLeft, ly + 1, 8, 6).fill(COLOUR.repower);
  doc.font('regular').fontSize(7.5).fillColor(COLOUR.ink).text('Capital spent', plotLeft + 11, ly, { lineBreak: false });
  doc.rect(plotLeft + 90, ly + 1, 8, 6).fill(COLOUR.gain);
  doc.fillColor(COLOUR.ink).text('Net cash flow vs rebuild (loss in red)', plotLeft + 101, ly, { lineBreak: false });
  doc.x = PAGE.left;
  doc.y = top + height;
}
