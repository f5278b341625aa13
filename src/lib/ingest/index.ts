/**
 * Reading pilot waves: uploaded bytes → checked table → codebook → proposed setup → confirmed,
 * recoded wave → screening → stored blob. Pure code apart from node:crypto (content hash) and
 * yauzl's in-memory zip reading; no file system, database or framework.
 *
 * Typical use (upload route, demo seed, command line, tests: docs/decisions/007):
 *   const read = await readWave({ fileName, bytes, codebookName, codebookBytes, sheet }, limits);
 *   const proposal = proposeSetup(read.table, read.codebook);      // shown in the setup form
 *   const { setup, wave, screening } = acceptWave(read.table, { setup: confirmedSetup, exclusions });
 *   // or, taking the proposal as it stands: acceptProposal(read)
 *   store(encodeMatrix(wave.matrix));
 *   // later, other exclusions from the stored matrix alone: applyExclusions({ matrix, items, warnings }, rows)
 * Anything the client's file or setup causes ends in a WaveRefusal (400, 413 or 422).
 */
export { WaveRefusal, isWaveRefusal, type WaveRefusalStatus } from './wave-refusal';
export { DEFAULT_READ_LIMITS, resolveReadLimits, type ReadLimits } from './read-limits';
export type * from './types';
export { readTable, type ReadTableOptions } from './read-table';
export { readWave, type ReadWave, type ReadWaveOptions, type WaveFiles } from './read-wave';
export { acceptWave, acceptProposal, type AcceptedWave, type AcceptedProposal, type AcceptProposalOptions, type WaveChoice } from './accept-wave';
export { decodeText, decodeWindows1252, looksBinary, type DecodedText, type TextEncodingName } from './decode-text';
export { detectFileKind, fileExtension, type FileKind } from './detect-file-kind';
export { sniffDelimiter, sniffDecimalSeparator, DELIMITERS, type Delimiter } from './sniff-delimiter';
export { readDelimitedText, type DelimitedText } from './read-delimited-text';
export { checkZipDirectory, type ZipDirectory } from './check-zip-directory';
export { readWorkbook, type WorkbookParser, type WorkbookRead, type WorkbookSheet } from './read-workbook';
export { parseWorkbook, type ParsedSheet } from './parse-workbook';
export { parseWorkbookInWorker, readUploadInWorker, acceptUploadInWorker } from './workbook-worker';
export { previewProposal, runWaveReaderJob, type AcceptedRead, type ProposalPreview, type UploadRead, type WaveReaderJob } from './wave-reader-jobs';
export { shapeTable, uniqueHeaders, type CellGrid } from './shape-table';
export { parseNumber, isBlankCell, looksLikeFormula } from './parse-number';
export { parseDuration, looksLikeTimeText } from './parse-duration';
export { parseValueLabels, formatValueLabels, labelKey, type ValueLabelsRead } from './value-labels';
export { ANSWER_SCALES, matchAnswerScales, isMissingAnswerText, type AnswerScale, type AnswerScaleMatch } from './answer-scales';
export { codebookColumnOf, looksLikeCodebookHeader, headerKey, type CodebookColumn } from './codebook-columns';
export { readCodebook, parseYesNo, parseMissingCodes, parseItemType } from './read-codebook';
export { findPersonalData, looksLikeEmail, looksLikePhoneNumber, sampleCells, type PersonalDataFinding } from './personal-data';
export { guessAnswerRange, type AnswerRangeGuess } from './guess-answer-range';
export { columnData, type ColumnData } from './column-profile';
export { proposeSetup, headerWords, columnsLeftOut, itemTypeOf, type ColumnLeftOut } from './propose-setup';
export { recodeCounts, recodeItem, reverseScore, type RecodedItem } from './recode-item';
export { validateSetup, waveSetupSchema, itemSetupSchema, type CheckedSetup } from './validate-setup';
export {
  buildWave, includedRows, checkExclusions, applyExclusions, identicalGroups, EXCLUSION_WARNING_CODES, type ExcludableWave, type WaveExclusions,
} from './build-wave';
export { encodeMatrix, decodeMatrix, MATRIX_BLOB_VERSION } from './matrix-blob';
export { contentHash } from './content-hash';
export { longStringIndex } from './screening/long-string-index';
export { withinPersonSd } from './screening/within-person-sd';
export { missingShare } from './screening/missing-share';
export { speedCheck, medianOf, type SpeedCheck } from './screening/speeders';
export {
  screenRespondents, answersAsGiven, DEFAULT_SCREENING_OPTIONS, type ScreeningOptions, type ScreeningFlag, type ScreeningResult, type ScreeningRule,
} from './screening/screen-respondents';
