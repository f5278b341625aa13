/**
 * Checks a zip-based workbook (XLSX, ODS) from its central directory alone, before any entry is
 * decompressed: entry count, total uncompressed size, encryption, compression methods, and
 * that each local header agrees with the directory. A zip bomb is refused from its declared
 * sizes at the cost of reading a few hundred bytes; a zip whose sizes might lie (entries with
 * a trailing data descriptor) is decompressed once by yauzl, which stops as soon as an entry
 * yields more than it declared, so the cost stays within the uncompressed-size limit.
 */
import { Buffer } from 'node:buffer';
import yauzl from 'yauzl';
import { formatMebibytes, type ReadLimits } from './read-limits';
import { WaveRefusal } from './wave-refusal';

/** What the central directory says. */
export interface ZipDirectory {
  /** `xlsx` for Office Open XML workbooks, `ods` for OpenDocument spreadsheets. */
  readonly kind: 'xlsx' | 'ods';
  readonly entryNames: readonly string[];
  /** Sum of the declared uncompressed sizes. */
  readonly uncompressedBytes: number;
}

// One size unit in every message (docs/decisions/014-hardening.md).

const LOCAL_HEADER_SIGNATURE = 0x04034b50;
const DATA_DESCRIPTOR_FLAG = 0x0008;
const ENCRYPTED_FLAG = 0x0001;
const ZIP64_MARKER = 0xffffffff;

function megabytes(bytes: number): string {
  return formatMebibytes(bytes);
}

function openZip(buffer: Buffer): Promise<yauzl.ZipFile> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(buffer, { lazyEntries: true, decodeStrings: true, validateEntrySizes: true, strictFileNames: false }, (error, zipfile) => {
      if (error || !zipfile) reject(error ?? new Error('no zip file'));
      else resolve(zipfile);
    });
  });
}

function listEntries(zipfile: yauzl.ZipFile, onEntry: (entry: yauzl.Entry) => void): Promise<void> {
  return new Promise((resolve, reject) => {
    zipfile.on('entry', (entry: yauzl.Entry) => {
      try {
        onEntry(entry);
        zipfile.readEntry();
      } catch (error) {
        reject(error);
      }
    });
    zipfile.on('end', () => resolve());
    zipfile.on('error', reject);
    zipfile.readEntry();
  });
}

function drainEntry(zipfile: yauzl.ZipFile, entry: yauzl.Entry): Promise<void> {
  return new Promise((resolve, reject) => {
    zipfile.openReadStream(entry, (error, stream) => {
      if (error || !stream) {
        reject(error ?? new Error('no stream'));
        return;
      }
      stream.on('data', () => undefined);
      stream.on('end', () => resolve());
      stream.on('error', (streamError: Error) => {
        stream.destroy();
        reject(streamError);
      });
    });
  });
}

/**
 * Reads and checks the central directory of a zip-based workbook.
 * @param bytes the file's bytes (starting with a zip signature).
 * @param fileName the uploaded name, for messages.
 * @param limits `maxZipEntries` and `maxUncompressedBytes` apply.
 * @throws {WaveRefusal} 413 `too-many-zip-entries`, 413 `zip-too-large` (declared uncompressed size
 *   past the limit); 422 `damaged-zip`, `workbook-encrypted`, `zip-sizes-inconsistent`,
 *   `unsupported-zip` (a compression method other than stored or deflate), `not-a-workbook`
 *   (a zip that is not an XLSX or ODS workbook).
 * @returns the kind of workbook, its entry names and declared uncompressed size.
 * References: PKWARE 2022, "APPNOTE.TXT - .ZIP File Format Specification" 6.3.10, §4.3.7, §4.3.9, §4.3.12, §4.3.16.
 */
export async function checkZipDirectory(bytes: Uint8Array, fileName: string, limits: ReadLimits): Promise<ZipDirectory> {
  const buffer = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const damaged = () => new WaveRefusal(422, 'damaged-zip', `"${fileName}" starts like a zip-based workbook but its zip directory cannot be read (the file may be cut short); save it again from its program.`);
  let zipfile: yauzl.ZipFile;
  try {
    zipfile = await openZip(buffer);
  } catch {
    throw damaged();
  }
  if (zipfile.entryCount > limits.maxZipEntries) {
    throw new WaveRefusal(413, 'too-many-zip-entries', `"${fileName}" holds ${zipfile.entryCount} packed parts, more than the limit of ${limits.maxZipEntries}; save the responses alone as XLSX or CSV.`);
  }
  const entryNames: string[] = [];
  const toVerify: yauzl.Entry[] = [];
  let uncompressedBytes = 0;
  try {
    await listEntries(zipfile, (entry) => {
      entryNames.push(entry.fileName);
      uncompressedBytes += entry.uncompressedSize;
      if (uncompressedBytes > limits.maxUncompressedBytes) {
        throw new WaveRefusal(413, 'zip-too-large', `"${fileName}" unpacks to more than ${megabytes(limits.maxUncompressedBytes)}, the limit for workbooks; upload only the responses sheet, or the responses as CSV.`);
      }
      if ((entry.generalPurposeBitFlag & ENCRYPTED_FLAG) !== 0) {
        throw new WaveRefusal(422, 'workbook-encrypted', `"${fileName}" is password-protected; save an unprotected copy and upload that.`);
      }
      if (entry.compressionMethod !== 0 && entry.compressionMethod !== 8) {
        throw new WaveRefusal(422, 'unsupported-zip', `"${fileName}" is packed with a compression method workbooks do not use; save it again from its program.`);
      }
      const offset = entry.relativeOffsetOfLocalHeader;
      if (offset + 30 > buffer.length || buffer.readUInt32LE(offset) !== LOCAL_HEADER_SIGNATURE) throw damaged();
      const localFlags = buffer.readUInt16LE(offset + 6);
      const localUncompressed = buffer.readUInt32LE(offset + 22);
      if ((localFlags & DATA_DESCRIPTOR_FLAG) !== 0 || localUncompressed === ZIP64_MARKER) {
        toVerify.push(entry);
      } else if (localUncompressed !== entry.uncompressedSize) {
        throw new WaveRefusal(422, 'zip-sizes-inconsistent', `"${fileName}" declares two different sizes for the part "${entry.fileName}", so it is damaged or crafted; save it again from its program.`);
      }
    });
  } catch (error) {
    if (error instanceof WaveRefusal) throw error;
    throw damaged();
  }
  const names = new Set(entryNames);
  let kind: 'xlsx' | 'ods';
  if (names.has('[Content_Types].xml') && (names.has('xl/workbook.xml') || names.has('xl/workbook.bin'))) kind = 'xlsx';
  else if (names.has('content.xml') && names.has('mimetype')) kind = 'ods';
  else {
    const what = names.has('word/document.xml') ? 'a Word document' : names.has('ppt/presentation.xml') ? 'a PowerPoint presentation' : 'a zip archive';
    throw new WaveRefusal(422, 'not-a-workbook', `"${fileName}" is ${what}, not a workbook; upload the responses as XLSX, XLS, ODS or CSV.`);
  }
  for (const entry of toVerify) {
    try {
      await drainEntry(zipfile, entry);
    } catch {
      throw new WaveRefusal(422, 'zip-sizes-inconsistent', `The part "${entry.fileName}" of "${fileName}" unpacks to a different size than it declares, so the file is damaged or crafted; save it again from its program.`);
    }
  }
  return { kind, entryNames, uncompressedBytes };
}
