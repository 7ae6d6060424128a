/**
 * The study report as a PDF (pdfmake on pdfkit, IBM Plex embedded), in the order a reviewer reads
 * it: title block (study, team, revision, author, date, review status; approver and date when
 * approved, else a "DRAFT — not reviewed" watermark), scope and assumptions, the one-line diagram
 * (vector) and an input table per element type, results (bus voltages, load terminal voltages,
 * element currents, power and losses, fault currents), phasor diagrams of the buses that carry
 * flags (vector), every flag with its limit and where the limit comes from, the caution; page
 * numbers and the revision on every page.
 * Pure data in, bytes out: it runs inline or in a worker thread (server/work).
 */
import type PdfMake from 'pdfmake';
import { SAFETY_CAUTION } from '../../shared/review/risk.ts';
import { busColumnGroups, flaggedBuses, inputGroups, NOTHING_DRAWN, scopeLines, solveReported } from '../../shared/report/document.ts';
import { oneLineSvg } from '../../shared/report/one-line.ts';
import { phasorLegend, phasorSvg } from '../../shared/report/phasor-svg.ts';
import { readPerUnitSettings, type ResultUnits } from '../../shared/report/per-unit.ts';
import { basesWords, busTable, elementTable, faultTable, flagTable, loadTable, powerTable, tableContext, type ResultTable } from '../../shared/report/tables.ts';
import { FONT_FILES, pdfText, REPORT_FONTS, resetUnprintable, unprintableCount } from './fonts.ts';

/**
 * pdfmake (with pdfkit and fontkit) is loaded on the first report, not when the server starts: an
 * idle server does not hold it (docs/performance-log.md). Its policies are set before any use.
 */
let pdfmakeReady: Promise<typeof PdfMake> | null = null;
function loadPdfmake(): Promise<typeof PdfMake> {
  return (pdfmakeReady ??= import('pdfmake').then(({ default: pdfmake }) => {
    pdfmake.setUrlAccessPolicy(() => false);
    pdfmake.setLocalAccessPolicy((p) => FONT_FILES.has(p));
    pdfmake.addFonts(REPORT_FONTS);
    return pdfmake;
  }));
}

/** Where the one-line diagram's page starts drawing, pt from the top (below its heading). */
const DIAGRAM_TOP = 72;

/** What the report is of: everything is plain data (it crosses a thread boundary). */
export interface ReportInput {
  study: { name: string; team: string };
  revision: { number: number; author: string; createdAt: string; message: string };
  review: { status: string; approved: boolean; approver?: string; approvedAt?: string };
  /** A study case id (absent: the base circuit). */
  caseId?: string;
  units: ResultUnits;
  content: { circuit: unknown; layout?: unknown; settings?: unknown };
  /** When the report is made (ISO), printed in the title block. */
  madeAt: string;
}

type Node = Record<string, unknown> | string;

const day = (iso: string) => iso.slice(0, 10);

function tableNode(t: ResultTable, opts: { fontSize?: number; columns?: number[]; widths?: (number | string)[] } = {}): Node[] {
  const cols = opts.columns ?? t.columns.map((_, i) => i);
  const body = [cols.map((i) => ({ text: pdfText(t.columns[i]), bold: true })), ...t.rows.map((r) => cols.map((i) => ({ text: pdfText(r[i] ?? '') })))];
  const out: Node[] = [{ text: pdfText(t.title), style: 'h3' }];
  if (t.rows.length === 0) out.push({ text: 'None.', style: 'small' });
  else out.push({ table: { headerRows: 1, dontBreakRows: true, widths: opts.widths ?? cols.map(() => '*'), body }, layout: 'lightHorizontalLines', fontSize: opts.fontSize ?? 7, margin: [0, 2, 0, 2] });
  if (t.note) out.push({ text: pdfText(t.note), style: 'small', margin: [0, 0, 0, 8] });
  return out;
}

function inputTables(circuit: unknown): Node[] {
  return inputGroups(circuit).flatMap(({ title, rows }) => [
    { text: pdfText(title), style: 'h3' },
    {
      table: { headerRows: 1, dontBreakRows: true, widths: [90, '*'], body: [[{ text: 'Name', bold: true }, { text: 'Parameters', bold: true }], ...rows.map(([id, p]) => [{ text: pdfText(id) }, { text: pdfText(p) }])] },
      layout: 'lightHorizontalLines',
      fontSize: 7.5,
      margin: [0, 2, 0, 6],
    },
  ]);
}

/** Builds the report of one revision (and case) and returns the PDF bytes. */
export async function renderReportPdf(input: ReportInput): Promise<Uint8Array> {
  const { circuit, caseName, names, result, failure } = solveReported(input.content.circuit, input.caseId);
  const perUnit = readPerUnitSettings(input.content.layout);
  const revisionWords = `Revision ${input.revision.number}${caseName ? `, case "${caseName}"` : ''}`;
  const title = input.study.name;
  // One line at the foot of every page, whatever the names' length: a long one would push the page number off the page.
  const footerWords = `${shorten(title, 60)} — Revision ${input.revision.number}${caseName ? `, case "${shorten(caseName, 30)}"` : ''}`;

  resetUnprintable();
  const footerText = pdfText(footerWords);
  const content: Node[] = [
    { text: pdfText(title), style: 'h1' },
    {
      table: {
        widths: [110, '*'],
        body: [
          ['Team', input.study.team],
          ['Revision', String(input.revision.number) + (input.revision.message ? ` — ${input.revision.message}` : '')],
          ...(caseName ? [['Study case', caseName]] : []),
          ['Author', input.revision.author],
          ['Revision date', day(input.revision.createdAt)],
          ['Review status', input.review.status],
          ...(input.review.approved ? [['Approved by', `${input.review.approver ?? ''}${input.review.approvedAt ? ` on ${day(input.review.approvedAt)}` : ''}`]] : []),
          ['Units', input.units === 'pu' ? `per unit. ${'(bases below)'}` : 'volts, amperes, kW and kvar'],
          ['Report made', day(input.madeAt)],
        ].map(([k, v]) => [{ text: pdfText(k), bold: true }, { text: pdfText(v) }]),
      },
      layout: 'noBorders',
      fontSize: 9,
      margin: [0, 0, 0, 8],
    },
    { text: pdfText(`Caution. ${SAFETY_CAUTION}`), style: 'caution' },
    { text: 'Scope and assumptions', style: 'h2' },
    { ul: scopeLines(circuit, result, caseName).map((l) => ({ text: pdfText(l) })), fontSize: 9 },
  ];

  // The drawing and its labels are placed at the same absolute spot of their own page (the labels as
  // PDF text: SVG text is slow to embed); IBM Plex's ascent is 1.025 em, so a label's top is its
  // baseline less that.
  const diagram = oneLineSvg(circuit, input.content.layout, 'Plex', { labels: false });
  const k = Math.min(515 / diagram.width, 680 / diagram.height, 1.5);
  const at = (x: number, y: number) => ({ x: 40 + (x - diagram.minX) * k, y: DIAGRAM_TOP + (y - diagram.minY) * k });
  content.push({ text: 'One-line diagram', style: 'h2', pageBreak: 'before' });
  content.push({ svg: diagram.svg, width: diagram.width * k, height: diagram.height * k, absolutePosition: at(diagram.minX, diagram.minY) });
  for (const l of diagram.labels) {
    const p = at(l.x, l.y);
    content.push({ text: pdfText(l.text), fontSize: l.size * k, bold: l.bold ?? false, color: l.colour ?? '#000000', lineHeight: 1, absolutePosition: { x: p.x, y: p.y - 1.025 * l.size * k } });
  }
  if (inputGroups(circuit).length === 0) content.push({ text: NOTHING_DRAWN });
  content.push({ text: 'Circuit inputs', style: 'h2', pageBreak: 'before' });
  content.push(...inputTables(circuit));
  if (inputGroups(circuit).length === 0) content.push({ text: NOTHING_DRAWN });

  content.push({ text: 'Results', style: 'h2', pageBreak: 'before' });
  if (!result) {
    content.push({ text: pdfText(`This revision cannot be solved: ${failure ?? ''}`), style: 'caution' });
  } else {
    const ctx = tableContext(circuit, result, input.units, perUnit);
    if (input.units === 'pu') content.push({ text: pdfText(basesWords(ctx)), style: 'small', margin: [0, 0, 0, 6] });
    const buses = busTable(ctx);
    busColumnGroups(buses.columns).forEach((g, i, all) => content.push(...tableNode({ ...buses, title: g.title, note: i === all.length - 1 ? buses.note : undefined }, { columns: g.columns })));
    content.push(...tableNode(loadTable(ctx)));
    content.push(...tableNode(elementTable(ctx)));
    content.push(...tableNode(powerTable(ctx)));
    if (result.faults.length) content.push(...tableNode(faultTable(ctx)));

    const diagrams = flaggedBuses(result, names);
    if (diagrams.length) {
      content.push({ text: 'Phasor diagrams of the flagged buses', style: 'h2', pageBreak: 'before' });
      content.push({ text: 'Voltages to earth from the origin (solid); line-to-neutral voltages from the neutral point (dashed).', style: 'small' });
      for (let i = 0; i < diagrams.length; i += 2) {
        content.push({
          columns: diagrams.slice(i, i + 2).map((b) => ({
            width: 250,
            stack: [
              { text: pdfText(b.bus), bold: true },
              { svg: phasorSvg(b, 'Plex', 200, { labels: false }), width: 200 },
              { text: phasorLegend(b).flatMap((l, k) => [...(k ? ['   '] : []), { text: pdfText(l.text), color: l.colour }]), fontSize: 8 },
            ],
          })),
          margin: [0, 6, 0, 6],
          unbreakable: true,
        });
      }
    }
    content.push({ text: 'Flags', style: 'h2', pageBreak: diagrams.length ? undefined : 'before' });
    content.push(...tableNode(flagTable(ctx), { fontSize: 7.5, widths: [42, 55, '*', 32, 32, 22, 75] }));
  }
  content.push({ text: 'Caution', style: 'h2' });
  content.push({ text: pdfText(SAFETY_CAUTION), style: 'caution' });
  // Letters of a script no shipped font covers were printed as "?": say so under the title block.
  const missed = unprintableCount();
  if (missed > 0) {
    content.splice(2, 0, {
      text: `${missed === 1 ? 'One letter' : `${missed} letters`} of the names in this report ${missed === 1 ? 'is' : 'are'} in a script the report's font cannot print and ${missed === 1 ? 'is' : 'are'} shown as "?". The study's print view shows every name as written.`,
      style: 'small',
      margin: [0, 0, 0, 6],
    });
  }

  const doc: Record<string, unknown> = {
    pageSize: 'A4',
    pageMargins: [40, 40, 40, 50],
    // PDF metadata is Unicode text (pdfkit writes it as UTF-16): the name as written.
    info: { title: `${title} — ${revisionWords}`, creator: 'Wyeward', producer: 'Wyeward' },
    defaultStyle: { font: 'Plex', fontSize: 9 },
    styles: {
      h1: { fontSize: 18, bold: true, margin: [0, 0, 0, 8] },
      h2: { fontSize: 13, bold: true, margin: [0, 10, 0, 4] },
      h3: { fontSize: 10, bold: true, margin: [0, 6, 0, 2] },
      small: { fontSize: 7, color: '#4b5563' },
      caution: { fontSize: 9, bold: true, color: '#7a1f00', margin: [0, 4, 0, 8] },
    },
    content,
    footer: (page: number, pages: number) => ({
      columns: [
        { text: footerText, alignment: 'left', noWrap: true },
        { text: `Page ${page} of ${pages}`, alignment: 'right', width: 80 },
      ],
      fontSize: 7,
      color: '#4b5563',
      margin: [40, 15, 40, 0],
    }),
    ...(input.review.approved ? {} : { watermark: { text: 'DRAFT — not reviewed', color: '#9ca3af', opacity: 0.18, bold: true, fontSize: 48 } }),
  };
  const pdfmake = await loadPdfmake();
  const buffer = await pdfmake.createPdf(doc).getBuffer();
  return new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
}

/** At most `max` characters (whole code points), cut at a space where one is near, with "…". */
function shorten(text: string, max: number): string {
  const chars = Array.from(text);
  if (chars.length <= max) return text;
  const cut = chars.slice(0, max - 1).join('');
  const space = cut.lastIndexOf(' ');
  return `${(space > max * 0.6 ? cut.slice(0, space) : cut).trimEnd()}…`;
}
