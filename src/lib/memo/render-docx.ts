/**
 * The memo as an editable Word document (DOCX, through the `docx` package). Figures go in as SVG
 * with a PNG fallback, so every word processor shows them and those that read SVG keep them sharp.
 */
import {
  AlignmentType, BorderStyle, Document, Footer, HeadingLevel, ImageRun, Packer, PageNumber, Paragraph, ShadingType,
  Table, TableCell, TableRow, TextRun, WidthType,
} from 'docx';
import { layoutFigure } from './figure-layout';
import type { MemoBlock, MemoDocument } from './memo-document';
import { figurePng, figureSvg } from './paint-figure';
import { printable } from './printable-text';

/** A4 with 2 cm margins: the text width in points. */
const CONTENT_WIDTH_PT = 595.28 - 2 * 56.7;
const TWIPS_PER_POINT = 20;
const PIXELS_PER_POINT = 96 / 72;
const FONT = 'Source Sans 3';
const INK = '1F2430';
const RULE = 'C9CCD3';

function text(value: string, options: { bold?: boolean; size?: number; italics?: boolean; colour?: string } = {}): TextRun {
  return new TextRun({ text: printable(value), bold: options.bold, italics: options.italics, size: options.size, color: options.colour ?? INK, font: FONT });
}

function cell(value: string, align: 'left' | 'right', header: boolean, widthTwips: number): TableCell {
  return new TableCell({
    width: { size: widthTwips, type: WidthType.DXA },
    shading: header ? { type: ShadingType.CLEAR, color: 'auto', fill: 'EEF0F4' } : undefined,
    margins: { top: 40, bottom: 40, left: 70, right: 70 },
    children: [
      new Paragraph({
        alignment: align === 'right' ? AlignmentType.RIGHT : AlignmentType.LEFT,
        children: [text(value, { bold: header, size: 17 })],
      }),
    ],
  });
}

function tableBlock(block: Extract<MemoBlock, { kind: 'table' }>): (Paragraph | Table)[] {
  const total = block.columns.reduce((sum, column) => sum + (column.weight ?? 1), 0);
  const widths = block.columns.map((column) => Math.round(((column.weight ?? 1) / total) * CONTENT_WIDTH_PT * TWIPS_PER_POINT));
  const border = { style: BorderStyle.SINGLE, size: 4, color: RULE };
  const table = new Table({
    width: { size: Math.round(CONTENT_WIDTH_PT * TWIPS_PER_POINT), type: WidthType.DXA },
    columnWidths: widths,
    borders: { top: border, bottom: border, left: { style: BorderStyle.NONE, size: 0, color: 'FFFFFF' }, right: { style: BorderStyle.NONE, size: 0, color: 'FFFFFF' }, insideHorizontal: border, insideVertical: { style: BorderStyle.NONE, size: 0, color: 'FFFFFF' } },
    rows: [
      new TableRow({ tableHeader: true, children: block.columns.map((column, index) => cell(column.label, column.align, true, widths[index])) }),
      ...block.rows.map((row) => new TableRow({ cantSplit: true, children: row.map((value, index) => cell(value, block.columns[index]?.align ?? 'left', false, widths[index])) })),
    ],
  });
  const out: (Paragraph | Table)[] = [table];
  if (block.caption) out.push(new Paragraph({ spacing: { before: 60, after: 160 }, children: [text(block.caption, { size: 16, italics: true, colour: '4A5060' })] }));
  else out.push(new Paragraph({ spacing: { after: 120 }, children: [] }));
  return out;
}

function factsTable(rows: readonly (readonly [string, string])[]): (Paragraph | Table)[] {
  const widths = [0.34, 0.66].map((share) => Math.round(share * CONTENT_WIDTH_PT * TWIPS_PER_POINT));
  const none = { style: BorderStyle.NONE, size: 0, color: 'FFFFFF' };
  const table = new Table({
    width: { size: Math.round(CONTENT_WIDTH_PT * TWIPS_PER_POINT), type: WidthType.DXA },
    columnWidths: widths,
    borders: { top: none, bottom: none, left: none, right: none, insideHorizontal: { style: BorderStyle.SINGLE, size: 2, color: 'E3E5EA' }, insideVertical: none },
    rows: rows.map(([label, value]) => new TableRow({ cantSplit: true, children: [cell(label, 'left', true, widths[0]), cell(value, 'left', false, widths[1])] })),
  });
  return [table, new Paragraph({ spacing: { after: 120 }, children: [] })];
}

function blockToDocx(block: MemoBlock): (Paragraph | Table)[] {
  switch (block.kind) {
    case 'heading':
      return [
        new Paragraph({
          heading: block.level === 1 ? HeadingLevel.HEADING_1 : block.level === 2 ? HeadingLevel.HEADING_2 : HeadingLevel.HEADING_3,
          spacing: { before: block.level === 1 ? 320 : 200, after: 100 },
          keepNext: true,
          children: [text(block.text, { bold: true, size: block.level === 1 ? 28 : block.level === 2 ? 23 : 21 })],
        }),
      ];
    case 'paragraph':
      return [new Paragraph({ spacing: { after: 120 }, children: [text(block.text, { size: block.tone === 'note' ? 18 : 20, italics: block.tone === 'note' })] })];
    case 'bullets':
      return block.items.map((item) => new Paragraph({ bullet: { level: 0 }, spacing: { after: 60 }, children: [text(item, { size: 19 })] }));
    case 'caution':
      return block.items.map(
        (item) =>
          new Paragraph({
            spacing: { after: 60 },
            shading: { type: ShadingType.CLEAR, color: 'auto', fill: 'FBF3E6' },
            border: { left: { style: BorderStyle.SINGLE, size: 18, color: '7A3208', space: 6 } },
            children: [text(item, { size: 19 })],
          }),
      );
    case 'facts':
      return factsTable(block.rows);
    case 'table':
      return tableBlock(block);
    case 'figure': {
      const drawing = layoutFigure(block.figure, CONTENT_WIDTH_PT);
      const size = { width: Math.round(drawing.width * PIXELS_PER_POINT), height: Math.round(drawing.height * PIXELS_PER_POINT) };
      return [
        new Paragraph({
          alignment: AlignmentType.CENTER,
          keepNext: true,
          children: [
            new ImageRun({
              type: 'svg',
              data: Buffer.from(figureSvg(drawing, block.caption), 'utf8'),
              transformation: size,
              fallback: { type: 'png', data: figurePng(drawing) },
              altText: { name: block.figure.kind, title: { 'overlap-map': 'Overlap map', eigenvalues: 'Eigenvalues', 'standard-errors': 'Standard errors' }[block.figure.kind], description: printable(block.caption) },
            }),
          ],
        }),
        new Paragraph({ spacing: { before: 60, after: 160 }, children: [text(block.caption, { size: 16, italics: true, colour: '4A5060' })] }),
      ];
    }
  }
}

/**
 * Renders the memo as a DOCX file.
 * @param memo the memo document.
 * @returns the file's bytes.
 */
export async function renderMemoDocx(memo: MemoDocument): Promise<Buffer> {
  const document = new Document({
    creator: 'Paredown',
    title: printable(memo.title),
    description: printable(memo.subtitle),
    styles: { default: { document: { run: { font: FONT, size: 20, color: INK } } } },
    sections: [
      {
        properties: { page: { size: { width: 11906, height: 16838 }, margin: { top: 1134, bottom: 1134, left: 1134, right: 1134 } } },
        footers: {
          default: new Footer({
            children: [
              new Paragraph({
                alignment: AlignmentType.RIGHT,
                children: [
                  text(`${memo.title} · page `, { size: 15, colour: '6B7080' }),
                  new TextRun({ children: [PageNumber.CURRENT], size: 15, color: '6B7080', font: FONT }),
                ],
              }),
            ],
          }),
        },
        children: [
          new Paragraph({ spacing: { after: 80 }, children: [text(memo.title, { bold: true, size: 36 })] }),
          new Paragraph({ spacing: { after: 240 }, children: [text(memo.subtitle, { size: 21, colour: '4A5060' })] }),
          ...memo.blocks.flatMap(blockToDocx),
        ],
      },
    ],
  });
  return Packer.toBuffer(document);
}
