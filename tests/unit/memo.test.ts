/**
 * The redundancy memo: what it says (built from the demo audit), and that the DOCX and PDF files
 * carry it. The files are opened and read back, not only produced: the DOCX is unzipped and its
 * document XML parsed; the PDF's text is extracted with pdftotext and its first pages rendered
 * with pdftoppm (Debian's poppler-utils) into test-results/memo/ for a person to look at.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import * as fontkit from 'fontkit';
import yauzl from 'yauzl';
import { describe, expect, it } from 'vitest';
import { auditInputFromWave } from '../../src/lib/audit/audit-input';
import { runAudit } from '../../src/lib/audit/run-audit';
import { acceptProposal, readWave } from '../../src/lib/ingest';
import { buildMemo } from '../../src/lib/memo/build-memo';
import { layoutFigure } from '../../src/lib/memo/figure-layout';
import type { MemoDocument } from '../../src/lib/memo/memo-document';
import { fontRuns, memoFonts, woffToSfnt } from '../../src/lib/memo/memo-fonts';
import type { MemoInput } from '../../src/lib/memo/memo-input';
import { renderMemoDocx } from '../../src/lib/memo/render-docx';
import { renderMemoPdf } from '../../src/lib/memo/render-pdf';

const outputFolder = join('test-results', 'memo');

async function demoAudit() {
  const { wave, screening } = acceptProposal(await readWave({
    fileName: 'library-pilot-1.csv', bytes: new Uint8Array(readFileSync('fixtures/demo/library-pilot-1.csv')),
    codebookName: 'library-codebook.csv', codebookBytes: new Uint8Array(readFileSync('fixtures/demo/library-codebook.csv')), sheet: null,
  }));
  const audit = await runAudit(auditInputFromWave(wave, { outcome: 'overall_sat' }), { bootstrap: 20, seed: 3, outcome: 'overall_sat' });
  return { audit, screening, respondentIds: wave.respondentIds ?? [] };
}

/** A study whose name and wording hold markup, formula-like text and three scripts. */
const hostileName = 'Members <script>alert(1)</script> =HYPERLINK("x") · Опрос участников · 会员调查';

function memoInput(audit: Awaited<ReturnType<typeof demoAudit>>['audit'], screening: Awaited<ReturnType<typeof demoAudit>>['screening']): MemoInput {
  const first = audit.recommendations[0];
  const dropped = first.actions.find((action) => action.action !== 'keep')?.item ?? first.cluster[1];
  return {
    study: { name: hostileName, description: 'Pilot of the member survey, "draft" & <b>bold</b>.', team: 'Riverbend Libraries Research' },
    wave: { label: 'Pilot 1', fileName: 'library-pilot-1.csv', confirmedAt: '2026-12-01T09:00:00.000Z' },
    audit: { id: 'audit-1', finishedAt: '2026-12-01T09:05:00.000Z', startedBy: 'Dana Designer', result: audit },
    screening: { respondents: screening.respondents, flags: screening.flags.map(({ code, count, message }) => ({ code, count, message })) },
    decisions: {
      version: 2,
      publishedBy: 'Dana Designer',
      publishedAt: '2026-12-01T11:00:00.000Z',
      items: audit.items.map((item) => ({
        itemId: item.id,
        decision: item.id === dropped ? 'drop' : 'keep',
        into: null,
        reason: item.id === dropped ? '=SUM(A1) asks what its partner asks; Вопрос повторяется' : '',
        wording: null,
        decidedBy: 'Dana Designer',
        decidedAt: '2026-12-01T10:00:00.000Z',
      })),
    },
    preparedBy: 'Dana Designer',
    review: { reviewer: 'Rae Reviewer', verdict: 'approved', at: '2026-12-02T08:00:00.000Z', comment: 'Fine by us.' },
    comments: [{ author: 'Rae Reviewer', at: '2026-12-02T07:00:00.000Z', about: `item ${dropped}`, body: 'Why this one?' }],
    generatedAt: '2026-12-02T09:00:00.000Z',
  };
}

function textOf(memo: MemoDocument): string {
  return JSON.stringify(memo);
}

function readZipEntry(bytes: Buffer, name: string): Promise<string> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(bytes, { lazyEntries: true }, (error, zip) => {
      if (error || !zip) return reject(error);
      zip.on('entry', (entry: yauzl.Entry) => {
        if (entry.fileName !== name) return zip.readEntry();
        zip.openReadStream(entry, (streamError, stream) => {
          if (streamError || !stream) return reject(streamError);
          const chunks: Buffer[] = [];
          stream.on('data', (chunk: Buffer) => chunks.push(chunk));
          stream.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
        });
      });
      zip.on('end', () => reject(new Error(`${name} is not in the archive`)));
      zip.readEntry();
    });
  });
}

function zipNames(bytes: Buffer): Promise<string[]> {
  return new Promise((resolve, reject) => {
    const names: string[] = [];
    yauzl.fromBuffer(bytes, { lazyEntries: true }, (error, zip) => {
      if (error || !zip) return reject(error);
      zip.on('entry', (entry: yauzl.Entry) => {
        names.push(entry.fileName);
        zip.readEntry();
      });
      zip.on('end', () => resolve(names));
      zip.readEntry();
    });
  });
}

describe('the memo built from the demo audit', async () => {
  const { audit, screening, respondentIds } = await demoAudit();
  const input = memoInput(audit, screening);
  Object.freeze(input);
  const memo = buildMemo(input);
  const headings = memo.blocks.filter((block) => block.kind === 'heading' && block.level === 1).map((block) => (block as { text: string }).text);

  it('holds every section a reviewer expects, in order', () => {
    expect(headings).toEqual([
      '1. Data and screening',
      '2. Settings',
      '3. Item descriptives',
      '4. Correlation structure',
      '5. Dimensionality',
      '6. Redundancy evidence',
      '7. Decisions',
      '8. Before and after the proposed cut',
      '9. Cautions and limitations',
      '10. Review',
      'Appendix: methods and sources',
    ]);
    // One evidence section per overlap cluster.
    const clusterHeadings = memo.blocks.filter((block) => block.kind === 'heading' && block.level === 2 && /^6\.\d+ /.test(block.text));
    expect(clusterHeadings).toHaveLength(audit.recommendations.length);
  });

  it('reports the study, the version, the review and the decisions', () => {
    const text = textOf(memo);
    expect(text).toContain('Published version 2');
    expect(text).toContain('Approved by Rae Reviewer');
    expect(text).toContain('Why this one?');
    const decisions = memo.blocks.find((block) => block.kind === 'table' && block.columns[1]?.label === 'Decision');
    expect(decisions && decisions.kind === 'table' ? decisions.rows.map((row) => row[1]) : []).toEqual(['Drop']);
    expect(text).toContain(`${audit.items.length - 1} items kept, 1 dropped`);
  });

  it('carries aggregates only: no respondent id of the wave appears in it', () => {
    const text = textOf(memo);
    expect(respondentIds.length).toBe(400);
    const leaked = respondentIds.filter((id) => text.includes(`"${id}"`) || new RegExp(`\\b${id}\\b`).test(text));
    expect(leaked).toEqual([]);
  });

  it('draws the overlap map with every item and the eigenvalues with the parallel-analysis line', () => {
    const map = memo.blocks.find((block) => block.kind === 'figure' && block.figure.kind === 'overlap-map');
    expect(map && map.kind === 'figure' && map.figure.kind === 'overlap-map' ? [...map.figure.items].sort() : []).toEqual([...audit.correlation.items].sort());
    if (!map || map.kind !== 'figure' || map.figure.kind !== 'overlap-map') throw new Error('no overlap map');
    const drawing = layoutFigure(map.figure, 480);
    const cells = drawing.shapes.filter((shape) => shape.kind === 'rect').length;
    // p² cells plus the 40 steps of the legend.
    expect(cells).toBe(audit.correlation.items.length ** 2 + 40);
    // The diagonal (r = 1) takes the darkest positive colour of the scale.
    expect(map.figure.matrix[0][0]).toBe(1);
    const eigen = memo.blocks.find((block) => block.kind === 'figure' && block.figure.kind === 'eigenvalues');
    expect(eigen && eigen.kind === 'figure' && eigen.figure.kind === 'eigenvalues' ? eigen.figure.random95?.length : 0).toBe(audit.eigenvalues.length);
  });

  it('shows the driver model before and after the cut when the audit has an outcome', () => {
    const figure = memo.blocks.find((block) => block.kind === 'figure' && block.figure.kind === 'standard-errors');
    if (!figure || figure.kind !== 'figure' || figure.figure.kind !== 'standard-errors') throw new Error('no standard-error figure');
    expect(figure.figure.hasCut).toBe(true);
    const removed = (audit.outcomeModel?.afterCut?.removed ?? []) as string[];
    expect(removed.length).toBeGreaterThan(0);
    // A removed item has no bar after the cut; every other item has both.
    for (const row of figure.figure.rows) expect(row.after === null).toBe(removed.includes(row.term));
    const table = memo.blocks.find((block) => block.kind === 'table' && block.columns[3]?.label === 'After / before');
    expect(table && table.kind === 'table' ? table.rows.length : 0).toBe(figure.figure.rows.length);
  });

  it('writes a DOCX whose document XML carries the content, escaped, with the figures', async () => {
    const bytes = await renderMemoDocx(memo);
    mkdirSync(outputFolder, { recursive: true });
    writeFileSync(join(outputFolder, 'demo-memo.docx'), bytes);
    const xml = await readZipEntry(bytes, 'word/document.xml');
    const text = xml.replace(/<[^>]+>/g, '');
    expect(text).toContain('7. Decisions');
    expect(text).toContain('Appendix: methods and sources');
    // Markup stays text: escaped in the XML, never an element.
    expect(xml).toContain('Members &lt;script&gt;alert(1)&lt;/script&gt;');
    expect(xml).not.toContain('<script>');
    // Every script survives in the editable file.
    expect(text).toContain('Опрос участников');
    expect(text).toContain('会员调查');
    // Item wording from the codebook reaches the evidence sections.
    const firstCluster = audit.recommendations[0].cluster[0];
    const wording = (audit.items.find((item) => item.id === firstCluster) as { text?: string }).text ?? '';
    expect(wording.length).toBeGreaterThan(5);
    // (compared up to its first character that XML escapes)
    expect(text).toContain(wording.split(/[&<>"']/)[0]);
    const media = (await zipNames(bytes)).filter((name) => name.startsWith('word/media/'));
    expect(media.some((name) => name.endsWith('.svg'))).toBe(true);
    expect(media.some((name) => name.endsWith('.png'))).toBe(true);
  });

  it('writes a PDF with Source Sans 3 embedded whose text a parser reads back, and renders its pages', async () => {
    const bytes = await renderMemoPdf(memo);
    mkdirSync(outputFolder, { recursive: true });
    const file = join(outputFolder, 'demo-memo.pdf');
    writeFileSync(file, bytes);
    const extracted = spawnSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    expect(extracted.status, extracted.stderr).toBe(0);
    const text = extracted.stdout;
    for (const heading of headings) expect(text).toContain(heading);
    expect(text).toContain('Members <script>alert(1)</script>');
    expect(text).toContain('Опрос участников');
    // Chinese is not in the shipped typeface: the memo says so instead of drawing boxes.
    expect(text).toMatch(/script that the memo.s typeface does not cover/);
    for (const id of audit.recommendations[0].cluster) expect(text).toContain(id);
    const fonts = spawnSync('pdffonts', [file], { encoding: 'utf8' }).stdout;
    expect(fonts).toMatch(/SourceSans3-Regular\s+CID TrueType\s+Identity-H\s+yes/);
    const rendered = spawnSync('pdftoppm', ['-r', '60', '-png', '-f', '1', '-l', '5', file, join(outputFolder, 'demo-memo-page')]);
    expect(rendered.status).toBe(0);
    const pages = readdirSync(outputFolder).filter((name) => name.startsWith('demo-memo-page') && name.endsWith('.png'));
    expect(pages.length).toBe(5);
    for (const page of pages) expect(statSync(join(outputFolder, page)).size).toBeGreaterThan(5_000);
  });
});

describe('the memo fonts', () => {
  it('unpacks each shipped WOFF file into a font with the same glyphs and coverage', () => {
    const folder = join('node_modules', '@fontsource', 'source-sans-3', 'files');
    const woff = readFileSync(join(folder, 'source-sans-3-latin-400-normal.woff'));
    const fromWoff = fontkit.create(woff) as fontkit.Font;
    const fromSfnt = fontkit.create(woffToSfnt(woff)) as fontkit.Font;
    expect(fromSfnt.numGlyphs).toBe(fromWoff.numGlyphs);
    expect(fromSfnt.postscriptName).toBe(fromWoff.postscriptName);
    for (const character of 'Aé€“') expect(fromSfnt.hasGlyphForCodePoint(character.codePointAt(0)!)).toBe(fromWoff.hasGlyphForCodePoint(character.codePointAt(0)!));
    expect(() => woffToSfnt(Buffer.from('not a font at all, but long enough to have a header of 44 bytes'))).toThrow(/not a WOFF/);
  });

  it('switches font file only where a script needs it', () => {
    const runs = fontRuns('Library, Библиотека, 图书馆.', memoFonts().regular);
    expect(runs.map((run) => [run.text, run.font?.name.replace('SourceSans3-regular-', '') ?? null])).toEqual([
      ['Library, ', 'latin'],
      ['Библиотека', 'cyrillic'],
      [', ', 'latin'],
      ['图书馆', null],
      ['.', 'latin'],
    ]);
  });
});
