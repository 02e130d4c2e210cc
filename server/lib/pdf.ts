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
  const doc = new PDFDocument({
    size: 'A5',
    margins: { top: MARGIN, left: MARGIN, right: MARGIN, bottom: MARGIN + FOOTER_H },
    compress: process.env.NODE_ENV !== 'test',
    info: { Title: pdfSafe(input.title), Creator: 'Tetherwise' },
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

  const range = doc.bufferedPageRange();
  for (let p = range.start; p < range.start + range.count; p++) {
    doc.switchToPage(p);
    const bottom = doc.page.margins.bottom;
    // the footer sits inside the bottom margin; without this pdfkit would start a new page for it
    doc.page.margins.bottom = 0;
    doc.font('Inter').fontSize(7).fillColor(MUTED);
    doc.text(pdfSafe(input.caution), MARGIN, doc.page.height - MARGIN - FOOTER_H + 8, { width: width - 40 });
    doc.text(`${p + 1} / ${range.count}`, MARGIN + width - 36, doc.page.height - MARGIN - FOOTER_H + 8, {
      width: 36,
      align: 'right',
    });
    doc.page.margins.bottom = bottom;
  }
  doc.end();
  return done;
}
