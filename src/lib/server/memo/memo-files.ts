/**
 * The memo's downloads: gathers the input, writes the memo and renders it as DOCX or PDF, with a
 * file name that says what it is.
 */
import { buildMemo } from '../../memo/build-memo';
import type { MemoDocument } from '../../memo/memo-document';
import { renderMemoDocx } from '../../memo/render-docx';
import { renderMemoPdf } from '../../memo/render-pdf';
import { gatherMemoInput, type MemoDecisionChoice } from './memo-input';

/** The memo's file formats and their media types. */
export const memoFormats = {
  docx: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
  pdf: 'application/pdf',
} as const;
export type MemoFormat = keyof typeof memoFormats;

/**
 * The memo document of an audit (for the preview page and the downloads).
 * @param auditId the audit (its guard has been passed).
 * @param choice which decisions to report.
 * @param preparedFor who asked for it.
 * @throws HttpError as gatherMemoInput does.
 * @returns the memo document.
 */
export function memoDocument(auditId: string, choice: MemoDecisionChoice, preparedFor: string): MemoDocument {
  return buildMemo(gatherMemoInput(auditId, choice, preparedFor));
}

/**
 * The memo as a file.
 * @param auditId the audit (its guard has been passed).
 * @param format docx or pdf.
 * @param choice which decisions to report.
 * @param preparedFor who asked for it.
 * @throws HttpError as gatherMemoInput does.
 * @returns the bytes, the file name and the media type.
 */
export async function memoFile(auditId: string, format: MemoFormat, choice: MemoDecisionChoice, preparedFor: string): Promise<{ bytes: Buffer; fileName: string; mediaType: string }> {
  const memo = memoDocument(auditId, choice, preparedFor);
  const bytes = format === 'docx' ? await renderMemoDocx(memo) : await renderMemoPdf(memo);
  return { bytes, fileName: `${memo.fileStem}.${format}`, mediaType: memoFormats[format] };
}
