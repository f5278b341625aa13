/**
 * The published cut list as files for programming: CSV (RFC 4180 through toCsv) and XLSX (through
 * xlsx-republish), the same rows in both, every text cell neutralised by neutraliseCell so no
 * spreadsheet runs it, and file names that say what they are.
 */
import * as XLSX from 'xlsx-republish';
import type { VersionDetail } from '../../api/handoff';
import { neutraliseCell, toCsv } from '../../export/spreadsheet-cells';
import { fileStem } from '../../memo/memo-format';
import { itemFate, staysInQuestionnaire } from '../../words/handoff';

/** The columns of the export, in order. */
export const exportHeader = [
  'new_order',
  'pilot_order',
  'item',
  'scale',
  'in_questionnaire',
  'what_became_of_it',
  'merged_into',
  'wording_to_program',
  'codebook_wording',
  'reason',
  'decided_by',
  'decided_at_utc',
] as const;

type Cell = string | number | null;

/**
 * The rows of a version's export: the header, then every item in questionnaire order; `new_order`
 * numbers the items that stay (blank for those taken out), `pilot_order` is the pilot wave's.
 * @param version the version.
 */
export function exportRows(version: VersionDetail): Cell[][] {
  let kept = 0;
  return [
    [...exportHeader],
    ...version.items.map((item) => [
      staysInQuestionnaire(item.decision) ? ++kept : null,
      item.position,
      item.itemId,
      item.scale,
      staysInQuestionnaire(item.decision) ? 'yes' : 'no',
      itemFate(item.decision, item.into),
      item.into,
      staysInQuestionnaire(item.decision) ? item.finalWording : null,
      item.codebookWording,
      item.reason,
      item.decidedBy,
      item.decidedAt,
    ]),
  ];
}

/**
 * The file name of an export, e.g. `paredown-cut-list-members-survey-2027-v2.xlsx`.
 * @param studyName the study.
 * @param version the version number.
 * @param extension csv or xlsx.
 */
export function exportFileName(studyName: string, version: number, extension: 'csv' | 'xlsx'): string {
  return `${fileStem('paredown-cut-list', studyName, `v${version}`)}.${extension}`;
}

/** The CSV text of a version (byte-order mark, CRLF, neutralised cells). */
export function exportCsv(version: VersionDetail): string {
  return toCsv(exportRows(version));
}

/**
 * The XLSX bytes of a version: a sheet "Cut list" with the rows, and a sheet "About" saying which
 * study, version, who published it and when. Text cells neutralised; the order column a number.
 * @param version the version.
 * @param studyName the study's name.
 */
export function exportXlsx(version: VersionDetail, studyName: string): Uint8Array<ArrayBuffer> {
  const cell = (value: Cell) => (typeof value === 'number' ? value : neutraliseCell(value));
  const rows = exportRows(version).map((row) => row.map(cell));
  const book = XLSX.utils.book_new();
  const sheet = XLSX.utils.aoa_to_sheet(rows);
  sheet['!cols'] = [{ wch: 6 }, { wch: 6 }, { wch: 12 }, { wch: 14 }, { wch: 8 }, { wch: 22 }, { wch: 12 }, { wch: 60 }, { wch: 60 }, { wch: 50 }, { wch: 18 }, { wch: 22 }];
  XLSX.utils.book_append_sheet(book, sheet, 'Cut list');
  const about = [
    ['study', studyName],
    ['version', version.number],
    ['published_by', version.publishedBy?.name ?? ''],
    ['published_at_utc', version.publishedAt],
    ['programmed_at_utc', version.programmedAt ?? ''],
    ['items_in_questionnaire', version.items.filter((item) => staysInQuestionnaire(item.decision)).length],
    ['items_taken_out', version.items.filter((item) => !staysInQuestionnaire(item.decision)).length],
  ].map((row) => row.map((value) => (typeof value === 'number' ? value : neutraliseCell(value))));
  XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet(about), 'About');
  return new Uint8Array(XLSX.write(book, { type: 'array', bookType: 'xlsx' }) as ArrayBuffer);
}
