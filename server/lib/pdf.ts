import { createRequire } from 'node:module';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import type { TimelineBlockType } from '@shared/compute/day/types';

/** One line of a crew member's cue card. */
export interface CueStep {
  /** elapsed seconds */
  start: number;
  end: number;
  kind: TimelineBlockType;
  text: string;
  details?: string[];
  /** the step lies (at least partly) in orbital night */
  night?: boolean;
}

export interface CueCard {
  member: string;
  name: string;
  tetherLengthM: number;
  steps: CueStep[];
  tools: string[];
}

export interface CueCardDocument {
  title: string;
  subtitle: string;
  caution: string;
  cards: CueCard[];
  nightWindows: { start: number; end: number }[];
  warnings: string[];
  formatTime: (seconds: number) => string;
  /** the GMT clock time of an elapsed time, when the plan has a start time: shown under each step's times */
  formatGmt?: (seconds: number) => string;
}

const fontDir = path.join(path.dirname(createRequire(import.meta.url).resolve('@fontsource/inter')), 'files');
const FONT_REGULAR = path.join(fontDir, 'inter-latin-400-normal.woff');
const FONT_BOLD = path.join(fontDir, 'inter-latin-700-normal.woff');

const INK = '#14202b';
const MUTED = '#55636f';
const NIGHT = '#2b3a8c';
const MARGIN = 36;
const FOOTER_H = 40;

/** The shipped Inter subset is Basic Latin, Latin-1 and punctuation: arrows and Greek letters become words, anything else "?". */
export function pdfSafe(text: string): string {
  return text
    .replace(/\s*→\s*/g, ' to ')
    .replace(/β/g, 'beta ')
    .replace(/[^\t\n\r\u0020-\u00ff\u2000-\u206f]/g, '?');
}

/** A pdfkit document in Inter, collected into one buffer when it ends. */
function openPdf(title: string, size: 'A5' | 'A4', layout: 'portrait' | 'landscape' = 'portrait') {
  const doc = new PDFDocument({
    size,
    layout,
    margins: { top: MARGIN, left: MARGIN, right: MARGIN, bottom: MARGIN + FOOTER_H },
    compress: process.env.NODE_ENV !== 'test',
    info: { Title: pdfSafe(title), Creator: 'Tetherwise' },
    bufferPages: true,
  });
  doc.registerFont('Inter', FONT_REGULAR);
  doc.registerFont('Inter-Bold', FONT_BOLD);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  return { doc, done };
}

/** The caution and the page number at the foot of every page, then the end of the document. */
function closePdf(doc: PDFKit.PDFDocument, caution: string, done: Promise<Buffer>): Promise<Buffer> {
  const width = doc.page.width - 2 * MARGIN;
  const range = doc.bufferedPageRange();
  for (let p = range.start; p < range.start + range.count; p++) {
    doc.switchToPage(p);
    const bottom = doc.page.margins.bottom;
    // the footer sits inside the bottom margin; without this pdfkit would start a new page for it
    doc.page.margins.bottom = 0;
    doc.font('Inter').fontSize(7).fillColor(MUTED);
    doc.text(pdfSafe(caution), MARGIN, doc.page.height - MARGIN - FOOTER_H + 8, { width: width - 40 });
    doc.text(`${p + 1} / ${range.count}`, MARGIN + width - 36, doc.page.height - MARGIN - FOOTER_H + 8, {
      width: 36,
      align: 'right',
    });
    doc.page.margins.bottom = bottom;
  }
  doc.end();
  return done;
}

/** One task of one crew member in the as-flown record: texts as printed. */
export interface AsFlownPdfRow {
  task: string;
  crew: string;
  worksite: string;
  planned: string;
  flown: string;
  /** flown start minus planned start, and flown length minus planned, or blank */
  startSlip: string;
  lengthSlip: string;
  /** the row ran long or started late: printed in the warning colour */
  late: boolean;
}

export interface AsFlownDocument {
  title: string;
  subtitle: string;
  summary: string[];
  rows: AsFlownPdfRow[];
  notes: string[];
  caution: string;
}

const LATE = '#a3321f';

/**
 * The as-flown record on A4 landscape: a summary, then every task of each crew member planned beside
 * flown with the slips, then the notes logged, with the planning-aid caution at the foot of every page.
 */
export function buildAsFlownPdf(input: AsFlownDocument): Promise<Buffer> {
  const { doc, done } = openPdf(input.title, 'A4', 'landscape');
  const width = doc.page.width - 2 * MARGIN;
  doc.font('Inter-Bold').fontSize(16).fillColor(INK).text(pdfSafe(input.title), { width });
  doc.font('Inter').fontSize(9).fillColor(MUTED).text(pdfSafe(input.subtitle), { width });
  doc.moveDown(0.6);
  doc.font('Inter').fontSize(10).fillColor(INK);
  for (const line of input.summary) doc.text(pdfSafe(line), { width });
  doc.moveDown(0.8);

  const cols: { key: keyof AsFlownPdfRow; label: string; w: number }[] = [
    { key: 'task', label: 'Task', w: 0.26 },
    { key: 'crew', label: 'Crew', w: 0.06 },
    { key: 'worksite', label: 'Worksite', w: 0.12 },
    { key: 'planned', label: 'Planned (elapsed)', w: 0.17 },
    { key: 'flown', label: 'Flown (elapsed)', w: 0.17 },
    { key: 'startSlip', label: 'Start slip', w: 0.11 },
    { key: 'lengthSlip', label: 'Length slip', w: 0.11 },
  ];
  const header = () => {
    const top = doc.y;
    let x = MARGIN;
    doc.font('Inter-Bold').fontSize(8.5).fillColor(MUTED);
    for (const c of cols) {
      doc.text(c.label, x, top, { width: c.w * width - 6 });
      x += c.w * width;
    }
    doc.y = top + 14;
    doc
      .moveTo(MARGIN, doc.y - 3)
      .lineTo(MARGIN + width, doc.y - 3)
      .strokeColor(MUTED)
      .lineWidth(0.5)
      .stroke();
  };
  header();
  for (const row of input.rows) {
    if (doc.y > doc.page.height - doc.page.margins.bottom - 24) {
      doc.addPage();
      header();
    }
    const top = doc.y;
    let x = MARGIN;
    let bottom = top;
    for (const c of cols) {
      const slip = c.key === 'startSlip' || c.key === 'lengthSlip';
      doc
        .font(c.key === 'task' ? 'Inter-Bold' : 'Inter')
        .fontSize(9)
        .fillColor(slip && row.late ? LATE : INK)
        .text(pdfSafe(String(row[c.key])), x, top, { width: c.w * width - 6 });
      bottom = Math.max(bottom, doc.y);
      x += c.w * width;
    }
    doc.x = MARGIN;
    doc.y = bottom + 4;
  }
  doc.moveDown(1);
  doc.font('Inter-Bold').fontSize(12).fillColor(INK).text('Notes', MARGIN, doc.y, { width });
  doc.moveDown(0.3);
  doc.font('Inter').fontSize(9).fillColor(INK);
  if (input.notes.length === 0) doc.fillColor(MUTED).text('No notes were logged.', { width });
  for (const n of input.notes) doc.text(pdfSafe(`• ${n}`), { width, paragraphGap: 2 });
  return closePdf(doc, input.caution, done);
}

const KIND_LABEL: Record<CueStep['kind'], string> = {
  egress: 'EGRESS',
  translate: 'MOVE',
  swap: 'SWAP',
  'restraint-in': 'GET IN',
  work: 'TASK',
  'restraint-out': 'GET OUT',
  wait: 'WAIT',
  ingress: 'INGRESS',
  'arm-ride': 'ARM',
};

/**
 * A cue-card PDF: one section per crew member (each starting on a new page) with the steps and
 * their elapsed times, the night windows, and the planning-aid caution at the foot of every page.
 * Streams are left uncompressed under test so the text operators can be read back.
 */
export function buildCueCardPdf(input: CueCardDocument): Promise<Buffer> {
  const { doc, done } = openPdf(input.title, 'A5');
  const width = doc.page.width - 2 * MARGIN;
  const t = input.formatTime;
  const nights = input.nightWindows.length
    ? input.nightWindows.map((w) => `${t(w.start)}–${t(w.end)}`).join(', ')
    : 'none within the EVA';

  input.cards.forEach((card, i) => {
    if (i > 0) doc.addPage();
    doc.font('Inter-Bold').fontSize(14).fillColor(INK).text(pdfSafe(input.title), { width });
    doc.font('Inter').fontSize(8.5).fillColor(MUTED).text(pdfSafe(input.subtitle), { width });
    doc.moveDown(0.6);
    doc
      .font('Inter-Bold')
      .fontSize(12)
      .fillColor(INK)
      .text(pdfSafe(`${card.member}  ${card.name}`), { width });
    doc.font('Inter').fontSize(8.5).fillColor(MUTED);
    doc.text(
      pdfSafe(`Safety tether ${card.tetherLengthM.toFixed(1)} m. Orbital night (elapsed): ${nights}.`),
      { width },
    );
    doc.text(pdfSafe(`Tools: ${card.tools.length ? card.tools.join(', ') : 'none listed'}.`), { width });
    doc.moveDown(0.6);
    for (const step of card.steps) {
      const y = doc.y;
      if (y > doc.page.height - doc.page.margins.bottom - 30) doc.addPage();
      const top = doc.y;
      doc
        .font('Inter-Bold')
        .fontSize(9)
        .fillColor(step.night ? NIGHT : INK);
      doc.text(`${t(step.start)}–${t(step.end)}`, MARGIN, top, { width: 62 });
      doc
        .font('Inter-Bold')
        .fontSize(7)
        .fillColor(MUTED)
        .text(KIND_LABEL[step.kind] + (step.night ? ' · NIGHT' : ''), MARGIN, top + 11, { width: 62 });
      if (input.formatGmt)
        doc.text(`${input.formatGmt(step.start)}–${input.formatGmt(step.end)} GMT`, MARGIN, top + 20, {
          width: 62,
        });
      doc
        .font('Inter')
        .fontSize(9)
        .fillColor(INK)
        .text(pdfSafe(step.text), MARGIN + 66, top, { width: width - 66 });
      for (const d of step.details ?? []) {
        doc
          .fontSize(8)
          .fillColor(MUTED)
          .text(pdfSafe(d), MARGIN + 74, doc.y, { width: width - 74 });
      }
      doc.x = MARGIN;
      doc.y = Math.max(doc.y, top + (input.formatGmt ? 29 : 20)) + 4;
    }
  });
  if (input.warnings.length) {
    doc.addPage();
    doc.font('Inter-Bold').fontSize(12).fillColor(INK).text('Warnings', { width });
    doc.moveDown(0.4);
    doc.font('Inter').fontSize(8.5);
    for (const w of input.warnings) doc.text(pdfSafe(`• ${w}`), { width, paragraphGap: 3 });
  }

  return closePdf(doc, input.caution, done);
}
