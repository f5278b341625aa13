/**
 * Source Sans 3, shipped with the app (@fontsource/source-sans-3), for the PDF memo. The package
 * splits the typeface by script (Latin, Latin extended, Greek, Cyrillic, Vietnamese), so the PDF
 * writer picks, character by character, the first file that has the glyph. Characters none of them
 * has (Chinese, Arabic, ...) are reported, so the memo can say where to read them in full.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { inflateSync } from 'node:zlib';
import * as fontkit from 'fontkit';

/** The styles the memo uses. */
export type MemoFontStyle = 'regular' | 'semibold' | 'italic';

const SUBSETS = ['latin', 'latin-ext', 'greek', 'greek-ext', 'cyrillic', 'cyrillic-ext', 'vietnamese'] as const;
const FILE_PART: Record<MemoFontStyle, string> = { regular: '400-normal', semibold: '600-normal', italic: '400-italic' };

/** One font file: the name it is registered under in the PDF and its glyph coverage. */
export interface MemoFontFile {
  readonly name: string;
  readonly bytes: Buffer;
  readonly covers: (codePoint: number) => boolean;
}

let cache: Record<MemoFontStyle, MemoFontFile[]> | null = null;

/**
 * Unpacks a WOFF 1.0 file into the plain TrueType/OpenType file it wraps (each table inflated
 * with zlib), so that the PDF writer need not inflate the tables again for every document.
 * @param woff the WOFF file.
 * @throws Error when the bytes are not a WOFF 1.0 file.
 * @returns the sfnt bytes.
 * References: W3C (2012), WOFF File Format 1.0, §3-§5.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.length < 44 || woff.readUInt32BE(0) !== 0x774f4646) throw new Error('woffToSfnt: not a WOFF 1.0 file');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables = Array.from({ length: numTables }, (_, index) => {
    const at = 44 + index * 20;
    const tag = woff.readUInt32BE(at);
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const checksum = woff.readUInt32BE(at + 16);
    const stored = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(stored) : stored;
    return { tag, checksum, data };
  });
  let entrySelector = 0;
  while (2 ** (entrySelector + 1) <= numTables) entrySelector += 1;
  const searchRange = 2 ** entrySelector * 16;
  const headerLength = 12 + 16 * numTables;
  const total = tables.reduce((sum, table) => sum + ((table.data.length + 3) & ~3), headerLength);
  const out = Buffer.alloc(total);
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerLength;
  tables.forEach((table, index) => {
    const at = 12 + index * 16;
    out.writeUInt32BE(table.tag, at);
    out.writeUInt32BE(table.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(table.data.length, at + 12);
    table.data.copy(out, offset);
    offset += (table.data.length + 3) & ~3;
  });
  return out;
}

function fontFolder(): string {
  const require = createRequire(import.meta.url);
  return join(dirname(require.resolve('@fontsource/source-sans-3/LICENSE')), 'files');
}

/**
 * The font files of each style, in the order they are tried (Latin first).
 * @throws Error when the shipped font files cannot be read (a broken install).
 * @returns the files per style.
 */
export function memoFonts(): Record<MemoFontStyle, MemoFontFile[]> {
  if (cache) return cache;
  const folder = fontFolder();
  const load = (style: MemoFontStyle): MemoFontFile[] =>
    SUBSETS.map((subset) => {
      const bytes = woffToSfnt(readFileSync(join(folder, `source-sans-3-${subset}-${FILE_PART[style]}.woff`)));
      const font = fontkit.create(bytes) as fontkit.Font;
      return { name: `SourceSans3-${style}-${subset}`, bytes, covers: (codePoint: number) => font.hasGlyphForCodePoint(codePoint) };
    });
  cache = { regular: load('regular'), semibold: load('semibold'), italic: load('italic') };
  return cache;
}

/** A piece of text and the font file that draws it (null: no shipped file has its glyphs). */
export interface FontRun {
  readonly text: string;
  readonly font: MemoFontFile | null;
}

/**
 * Splits text into runs that one font file can draw. A character stays in the run before it
 * whenever that run's file has its glyph, so a line of mixed scripts changes font only where it must.
 * @param text the text.
 * @param files the files of one style.
 * @returns the runs, in order.
 */
export function fontRuns(text: string, files: readonly MemoFontFile[]): FontRun[] {
  const runs: { text: string; font: MemoFontFile | null }[] = [];
  for (const character of text) {
    const codePoint = character.codePointAt(0) ?? 32;
    const last = runs[runs.length - 1];
    if (last && last.font && last.font.covers(codePoint)) {
      last.text += character;
      continue;
    }
    const font = files.find((file) => file.covers(codePoint)) ?? null;
    if (last && last.font === font) last.text += character;
    else runs.push({ text: character, font });
  }
  return runs;
}
