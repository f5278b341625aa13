/**
 * Reads the multipart body of a wave upload with a cap on its size: the declared length is
 * checked before a byte is read, and the stream is cut off as soon as it passes the cap, so an
 * oversized upload costs at most the cap in memory.
 */
import { formatMebibytes } from '../../words/formats';
import { HttpError } from '../errors';
import { readBodyCapped } from '../read-body';

/** Room for a codebook file and the form's framing on top of the upload limit. */
export const CODEBOOK_AND_FORM_ALLOWANCE = 8 * 1024 * 1024;

/** One file of the form. */
export interface UploadedFile {
  /** The file name, without any folder part, control characters removed, at most 200 characters. */
  readonly name: string;
  readonly bytes: Uint8Array;
}

/** The fields of a wave upload. */
export interface UploadForm {
  readonly file: UploadedFile;
  readonly codebook: UploadedFile | null;
  /** Workbooks: the responses sheet asked for. */
  readonly sheet: string | null;
  readonly label: string | null;
  /** Store a new wave even when the same upload is already in the study. */
  readonly asNewWave: boolean;
}

function tooLarge(limitBytes: number): HttpError {
  return new HttpError(
    413,
    'file-too-large',
    `The upload is larger than the limit of ${formatMebibytes(limitBytes)} (plus room for a codebook); upload only the responses needed, or a sample.`,
  );
}

/**
 * Reads a request body into memory, refusing it once it passes a size (the server's one capped
 * reader, src/lib/server/read-body.ts, with the upload's own 413).
 * @param request the request.
 * @param capBytes the most bytes read.
 * @param limitBytes the configured upload limit (named in the message).
 * @throws HttpError 413 `file-too-large` when the declared or actual length passes the cap; 400 `bad-body` when the stream fails.
 * @returns the bytes.
 */
export function readCappedBody(request: Request, capBytes: number, limitBytes: number): Promise<Uint8Array<ArrayBuffer>> {
  return readBodyCapped(request, capBytes, () => tooLarge(limitBytes));
}

/**
 * A file name safe to keep and show: the last path part, no control characters, trimmed.
 * @param name the name the client sent.
 * @returns the cleaned name, `upload` when nothing is left.
 */
export function cleanFileName(name: string): string {
  const last = name.split(/[\\/]/).pop() ?? '';
  // eslint-disable-next-line no-control-regex
  const cleaned = last.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  if (cleaned === '') return 'upload';
  if (cleaned.length <= 200) return cleaned;
  const dot = cleaned.lastIndexOf('.');
  const extension = dot > 0 && cleaned.length - dot <= 10 ? cleaned.slice(dot) : '';
  return cleaned.slice(0, 200 - extension.length) + extension;
}

function textField(form: FormData, name: string, most: number): string | null {
  const value = form.get(name);
  if (value === null) return null;
  if (typeof value !== 'string') throw new HttpError(400, 'invalid-field', `The form field "${name}" must be text, not a file.`);
  const trimmed = value.trim();
  if (trimmed.length > most) throw new HttpError(400, 'invalid-field', `The form field "${name}" is longer than ${most} characters.`);
  return trimmed === '' ? null : trimmed;
}

async function fileField(form: FormData, name: string): Promise<UploadedFile | null> {
  const value = form.get(name);
  if (value === null || value === '') return null;
  if (typeof value === 'string') throw new HttpError(400, 'invalid-field', `The form field "${name}" must be a file.`);
  return { name: cleanFileName(value.name), bytes: new Uint8Array(await value.arrayBuffer()) };
}

/**
 * Reads the upload form: `file` (required), `codebook` (optional file), `sheet`, `label`,
 * `asNewWave` (optional text).
 * @param request the request.
 * @param uploadLimitBytes the configured upload limit; the body may be this plus {@link CODEBOOK_AND_FORM_ALLOWANCE}.
 * @throws HttpError 413 `file-too-large`; 400 `not-multipart` (another content type), `bad-form`
 *   (a body that does not parse), `file-required`, `invalid-field`.
 * @returns the fields.
 * References: Masinter 2015, RFC 7578 "Returning Values from Forms: multipart/form-data"; Fielding, Nottingham &
 *   Reschke 2022, RFC 9110 "HTTP Semantics" §15.5.14 (413 Content Too Large).
 */
export async function readUploadForm(request: Request, uploadLimitBytes: number): Promise<UploadForm> {
  const contentType = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data\s*;/i.test(contentType)) {
    throw new HttpError(400, 'not-multipart', 'Send the upload as multipart/form-data with the responses in the field "file".');
  }
  const bytes = await readCappedBody(request, uploadLimitBytes + CODEBOOK_AND_FORM_ALLOWANCE, uploadLimitBytes);
  let form: FormData;
  try {
    form = await new Response(bytes, { headers: { 'content-type': contentType } }).formData();
  } catch {
    throw new HttpError(400, 'bad-form', 'The upload form could not be read; send multipart/form-data with the responses in the field "file".');
  }
  const file = await fileField(form, 'file');
  if (!file) throw new HttpError(400, 'file-required', 'The upload has no file: put the responses in the form field "file".');
  const asNew = textField(form, 'asNewWave', 10);
  return {
    file,
    codebook: await fileField(form, 'codebook'),
    sheet: textField(form, 'sheet', 200),
    label: textField(form, 'label', 100),
    asNewWave: asNew !== null && ['1', 'true', 'yes', 'on'].includes(asNew.toLowerCase()),
  };
}
