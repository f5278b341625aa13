/**
 * The memo as a PDF (pdfkit), with Source Sans 3 embedded from the shipped font files and the
 * figures drawn as vectors from the same layout as the DOCX and the preview.
 */
import PDFDocument from 'pdfkit';
import { layoutFigure, type FigureDrawing } from './figure-layout';
import type { MemoBlock, MemoColumn, MemoDocument, MemoFigure } from './memo-document';
import { fontRuns, memoFonts, type MemoFontStyle } from './memo-fonts';
import { printable } from './printable-text';

type Pdf = InstanceType<typeof PDFDocument>;

const MARGIN = 56.7;
const PAGE_WIDTH = 595.28;
const PAGE_HEIGHT = 841.89;
const CONTENT_WIDTH = PAGE_WIDTH - 2 * MARGIN;
const BOTTOM = PAGE_HEIGHT - MARGIN;
const INK = '#1f2430';
const MUTED = '#4a5060';
const RULE = '#c9ccd3';

/** What the writer keeps while it lays out pages. */
interface PdfState {
  readonly doc: Pdf;
  /** Set when a character had no glyph in any shipped font file. */
  missingGlyphs: boolean;
}

function fontName(style: MemoFontStyle): string {
  return memoFonts()[style][0].name;
}

/** Prepares text for measuring: characters without a glyph count as question marks. */
function measurable(text: string, style: MemoFontStyle): string {
  return fontRuns(printable(text), memoFonts()[style])
    .map((run) => (run.font ? run.text : '?'.repeat([...run.text].length)))
    .join('');
}

function heightOf(state: PdfState, text: string, style: MemoFontStyle, size: number, width: number): number {
  state.doc.font(fontName(style)).fontSize(size);
  return state.doc.heightOfString(measurable(text, style), { width, lineGap: 1.5 });
}

/** Writes text at (x, y) within a width, switching font files where the script needs it. */
function write(
  state: PdfState,
  text: string,
  style: MemoFontStyle,
  size: number,
  x: number,
  y: number,
  options: { width: number; align?: 'left' | 'right' | 'center'; colour?: string },
): void {
  const { doc } = state;
  const runs = fontRuns(printable(text), memoFonts()[style]);
  if (runs.length === 0) return;
  doc.fillColor(options.colour ?? INK);
  runs.forEach((run, index) => {
    if (!run.font) state.missingGlyphs = true;
    const piece = run.font ? run.text : '?'.repeat([...run.text].length);
    doc.font(run.font?.name ?? fontName(style)).fontSize(size);
    const continued = index < runs.length - 1;
    if (index === 0) doc.text(piece, x, y, { width: options.width, align: options.align ?? 'left', continued, lineGap: 1.5 });
    else doc.text(piece, { continued, lineGap: 1.5 });
  });
}

function ensureSpace(state: PdfState, height: number): void {
  if (state.doc.y + height > BOTTOM) state.doc.addPage();
}

function columnWidths(columns: readonly MemoColumn[]): number[] {
  const total = columns.reduce((sum, column) => sum + (column.weight ?? 1), 0);
  return columns.map((column) => ((column.weight ?? 1) / total) * CONTENT_WIDTH);
}

const PAD = 3;

function tableRow(state: PdfState, cells: readonly string[], columns: readonly MemoColumn[], widths: number[], style: MemoFontStyle, size: number): number {
  return Math.max(
    size + 2 * PAD,
    ...cells.map((value, index) => heightOf(state, value, style, size, widths[index] - 2 * PAD) + 2 * PAD),
  );
}

function drawRow(state: PdfState, cells: readonly string[], columns: readonly MemoColumn[], widths: number[], style: MemoFontStyle, size: number, shade: boolean): void {
  const { doc } = state;
  const height = tableRow(state, cells, columns, widths, style, size);
  const top = doc.y;
  if (shade) doc.rect(MARGIN, top, CONTENT_WIDTH, height).fill('#eef0f4');
  let x = MARGIN;
  cells.forEach((value, index) => {
    write(state, value, style, size, x + PAD, top + PAD, { width: widths[index] - 2 * PAD, align: columns[index]?.align === 'right' ? 'right' : 'left' });
    x += widths[index];
  });
  doc.moveTo(MARGIN, top + height).lineTo(MARGIN + CONTENT_WIDTH, top + height).lineWidth(0.4).strokeColor(RULE).stroke();
  doc.x = MARGIN;
  doc.y = top + height;
}

function drawTable(state: PdfState, block: Extract<MemoBlock, { kind: 'table' }>): void {
  const { doc } = state;
  const widths = columnWidths(block.columns);
  const size = 8;
  const header = block.columns.map((column) => column.label);
  const headerHeight = tableRow(state, header, block.columns, widths, 'semibold', size);
  ensureSpace(state, headerHeight + 2 * (size + 2 * PAD));
  drawRow(state, header, block.columns, widths, 'semibold', size, true);
  for (const row of block.rows) {
    const height = tableRow(state, row, block.columns, widths, 'regular', size);
    if (doc.y + height > BOTTOM) {
      doc.addPage();
      drawRow(state, header, block.columns, widths, 'semibold', size, true);
    }
    drawRow(state, row, block.columns, widths, 'regular', size, false);
  }
  if (block.caption) {
    doc.y += 3;
    const height = heightOf(state, block.caption, 'italic', 7.5, CONTENT_WIDTH);
    ensureSpace(state, height);
    write(state, block.caption, 'italic', 7.5, MARGIN, doc.y, { width: CONTENT_WIDTH, colour: MUTED });
  }
  doc.y += 8;
}

function drawFacts(state: PdfState, rows: readonly (readonly [string, string])[]): void {
  const { doc } = state;
  const columns: MemoColumn[] = [{ label: '', align: 'left', weight: 1.3 }, { label: '', align: 'left', weight: 2.7 }];
  const widths = columnWidths(columns);
  for (const [label, value] of rows) {
    const height = Math.max(heightOf(state, label, 'semibold', 8.5, widths[0] - 2 * PAD), heightOf(state, value, 'regular', 8.5, widths[1] - 2 * PAD)) + 2 * PAD;
    ensureSpace(state, height);
    const top = doc.y;
    write(state, label, 'semibold', 8.5, MARGIN + PAD, top + PAD, { width: widths[0] - 2 * PAD, colour: MUTED });
    write(state, value, 'regular', 8.5, MARGIN + widths[0] + PAD, top + PAD, { width: widths[1] - 2 * PAD });
    doc.moveTo(MARGIN, top + height).lineTo(MARGIN + CONTENT_WIDTH, top + height).lineWidth(0.3).strokeColor('#e3e5ea').stroke();
    doc.x = MARGIN;
    doc.y = top + height;
  }
  doc.y += 8;
}

function drawFigure(state: PdfState, drawing: FigureDrawing, caption: string): void {
  const { doc } = state;
  const captionHeight = heightOf(state, caption, 'italic', 7.5, CONTENT_WIDTH);
  ensureSpace(state, drawing.height + captionHeight + 10);
  const left = MARGIN + (CONTENT_WIDTH - drawing.width) / 2;
  const top = doc.y;
  for (const shape of drawing.shapes) {
    if (shape.kind === 'rect') {
      doc.rect(left + shape.x, top + shape.y, shape.w, shape.h).fill(shape.fill);
    } else if (shape.kind === 'circle') {
      doc.circle(left + shape.cx, top + shape.cy, shape.r).fill(shape.fill);
    } else if (shape.kind === 'line') {
      const [first, ...rest] = shape.points;
      doc.moveTo(left + first[0], top + first[1]);
      for (const [x, y] of rest) doc.lineTo(left + x, top + y);
      if (shape.dash) doc.dash(shape.dash[0], { space: shape.dash[1] });
      doc.lineWidth(shape.width).strokeColor(shape.stroke).stroke();
      doc.undash();
    } else {
      doc.font(fontName('regular')).fontSize(shape.size);
      const width = doc.widthOfString(measurable(shape.text, 'regular'));
      const offset = shape.anchor === 'end' ? -width : shape.anchor === 'middle' ? -width / 2 : 0;
      doc.save();
      if (shape.rotate) doc.rotate(shape.rotate, { origin: [left + shape.x, top + shape.y] });
      doc.fillColor(shape.fill).text(measurable(shape.text, 'regular'), left + shape.x + offset, top + shape.y, { lineBreak: false, baseline: 'alphabetic' });
      doc.restore();
    }
  }
  doc.x = MARGIN;
  doc.y = top + drawing.height + 4;
  write(state, caption, 'italic', 7.5, MARGIN, doc.y, { width: CONTENT_WIDTH, colour: MUTED });
  doc.y += 10;
}

function figureWidth(figure: MemoFigure): number {
  return figure.kind === 'overlap-map' ? CONTENT_WIDTH : Math.min(CONTENT_WIDTH, 420);
}

function drawBlock(state: PdfState, block: MemoBlock): void {
  const { doc } = state;
  switch (block.kind) {
    case 'heading': {
      const size = block.level === 1 ? 14 : block.level === 2 ? 11.5 : 10;
      doc.y += block.level === 1 ? 10 : 6;
      // Keep a heading with at least a few lines of what follows.
      ensureSpace(state, heightOf(state, block.text, 'semibold', size, CONTENT_WIDTH) + 60);
      write(state, block.text, 'semibold', size, MARGIN, doc.y, { width: CONTENT_WIDTH });
      doc.y += 4;
      return;
    }
    case 'paragraph': {
      const style: MemoFontStyle = block.tone === 'note' ? 'italic' : 'regular';
      ensureSpace(state, heightOf(state, block.text, style, 9.5, CONTENT_WIDTH));
      write(state, block.text, style, 9.5, MARGIN, doc.y, { width: CONTENT_WIDTH, colour: block.tone === 'note' ? MUTED : INK });
      doc.y += 6;
      return;
    }
    case 'bullets':
      for (const item of block.items) {
        ensureSpace(state, heightOf(state, item, 'regular', 9, CONTENT_WIDTH - 12));
        const top = doc.y;
        write(state, '•', 'regular', 9, MARGIN + 2, top, { width: 10 });
        write(state, item, 'regular', 9, MARGIN + 12, top, { width: CONTENT_WIDTH - 12 });
        doc.y += 3;
      }
      doc.y += 4;
      return;
    case 'caution':
      for (const item of block.items) {
        const height = heightOf(state, item, 'regular', 9, CONTENT_WIDTH - 16) + 8;
        ensureSpace(state, height);
        const top = doc.y;
        doc.rect(MARGIN, top, CONTENT_WIDTH, height).fill('#fbf3e6');
        doc.rect(MARGIN, top, 3, height).fill('#7a3208');
        write(state, item, 'regular', 9, MARGIN + 10, top + 4, { width: CONTENT_WIDTH - 16 });
        doc.y = top + height + 3;
      }
      doc.y += 4;
      return;
    case 'facts':
      drawFacts(state, block.rows);
      return;
    case 'table':
      drawTable(state, block);
      return;
    case 'figure':
      drawFigure(state, layoutFigure(block.figure, figureWidth(block.figure)), block.caption);
      return;
  }
}

/**
 * Renders the memo as a PDF.
 * @param memo the memo document.
 * @returns the file's bytes.
 */
export function renderMemoPdf(memo: MemoDocument): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: MARGIN, bottom: MARGIN, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: printable(memo.title), Subject: printable(memo.subtitle), Creator: 'Paredown', Producer: 'Paredown' },
  });
  for (const files of Object.values(memoFonts())) for (const file of files) doc.registerFont(file.name, file.bytes);
  const state: PdfState = { doc, missingGlyphs: false };
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  write(state, memo.title, 'semibold', 20, MARGIN, MARGIN, { width: CONTENT_WIDTH });
  doc.y += 2;
  write(state, memo.subtitle, 'regular', 10.5, MARGIN, doc.y, { width: CONTENT_WIDTH, colour: MUTED });
  doc.y += 14;
  memo.blocks.forEach((block, index) => {
    const next = memo.blocks[index + 1];
    // A heading stays on the page of the figure it introduces.
    if (block.kind === 'heading' && next?.kind === 'figure') {
      ensureSpace(state, 40 + layoutFigure(next.figure, figureWidth(next.figure)).height);
    }
    drawBlock(state, block);
  });
  if (state.missingGlyphs) {
    doc.y += 6;
    drawBlock(state, {
      kind: 'paragraph',
      tone: 'note',
      text: 'Some names or wording use a script that the memo’s typeface does not cover; those characters show as question marks here. The DOCX version of this memo shows them in full.',
    });
  }
  const range = doc.bufferedPageRange();
  for (let page = range.start; page < range.start + range.count; page += 1) {
    doc.switchToPage(page);
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const title = memo.title.length > 70 ? `${memo.title.slice(0, 69)}…` : memo.title;
    write(state, `${title} · page ${page + 1} of ${range.count}`, 'regular', 7.5, MARGIN, PAGE_HEIGHT - MARGIN / 2 - 4, { width: CONTENT_WIDTH, align: 'right', colour: '#6b7080' });
    doc.page.margins.bottom = bottom;
  }
  doc.end();
  return done;
}
