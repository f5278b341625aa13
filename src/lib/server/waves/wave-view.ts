/**
 * What the wave routes answer: one shape for the upload, the setup confirmation and the wave
 * itself, with respondent-level parts (proposal examples, flagged rows, exclusions) only for
 * callers who may read respondents (owners and designers).
 */
import { asc, eq } from 'drizzle-orm';
import { waveItems } from '../../../db/schema';
import type { ScreeningResult, WaveWarning } from '../../ingest';
import { getDb } from '../db';
import {
  mergeWarnings, parseStoredSetup, screeningDetail, screeningSummary, waveSummary, type StoredWaveSetup, type WaveRow,
} from './stored-wave';
import type { ItemView, WaveView } from '../../api/waves';
export type { ItemView, OutcomeView, WaveView } from '../../api/waves';

/**
 * A warning as a caller without `read:respondents` may see it: the ones that quote respondent
 * ids (`duplicate-respondent-id`) keep their count only. Every other warning names columns and
 * counts, never a respondent's id or answer (docs/decisions/014-hardening.md).
 * @param warning the warning as stored.
 * @returns the warning to show.
 */
export function aggregateWarning(warning: WaveWarning): WaveWarning {
  if (warning.code !== 'duplicate-respondent-id') return warning;
  const counted = /^(\d+) respondent/.exec(warning.message);
  const n = counted ? Number(counted[1]) : null;
  const message = n === null
    ? 'Some respondent ids appear more than once; check for doubled rows.'
    : `${n} respondent ${n === 1 ? 'id appears' : 'ids appear'} more than once; check for doubled rows.`;
  return { code: warning.code, columns: warning.columns, message };
}

/** The parts of a view that a build (stored or not) supplies. */
export interface ViewParts {
  row: WaveRow;
  stored: StoredWaveSetup;
  screening: ScreeningResult | null;
  respondentIds: readonly string[] | null;
  items: ItemView[];
  exclusions: readonly number[];
}

/**
 * Assembles the view.
 * @param parts the wave row (or what it would become), its document, screening, ids, items and exclusions.
 * @param respondentLevel whether the caller may read respondent-level data.
 * @returns the view.
 */
export function assembleView(parts: ViewParts, respondentLevel: boolean): WaveView {
  const { row, stored, screening } = parts;
  return {
    wave: { ...waveSummary(row, stored), excluded: parts.exclusions.length },
    proposal: respondentLevel && stored.proposal.length > 0 ? { respondents: stored.respondents, columns: [...stored.proposal] } : null,
    setup: respondentLevel ? stored.columns : null,
    items: parts.items,
    outcomes: (stored.outcomes ?? []).map(({ id, header, counts }) => ({ id, header, counts })),
    warnings: respondentLevel ? mergeWarnings(stored.warnings, stored.buildWarnings) : mergeWarnings(stored.warnings, stored.buildWarnings).map(aggregateWarning),
    screening: respondentLevel ? screeningDetail(screening, parts.respondentIds) : screeningSummary(screening),
    screeningNote: screening ? null : stored.screeningNote ?? 'No screening has been made for this wave.',
    exclusions: respondentLevel ? [...parts.exclusions] : null,
  };
}

/**
 * The view of a stored wave.
 * @param row the wave row.
 * @param respondentLevel whether the caller may read respondent-level data.
 * @returns the view, with its items read from `wave_items`.
 */
export function storedWaveView(row: WaveRow, respondentLevel: boolean): WaveView {
  const stored = parseStoredSetup(row.setup, row.rowCount);
  const items = getDb().select().from(waveItems).where(eq(waveItems.waveId, row.id)).orderBy(asc(waveItems.position)).all();
  return assembleView({
    row,
    stored,
    screening: (row.screening ?? null) as ScreeningResult | null,
    respondentIds: row.respondentIds,
    items: items.map((item) => ({
      position: item.position,
      id: item.itemId,
      header: item.header,
      scale: item.scale,
      reverse: item.reverse,
      min: item.min,
      max: item.max,
      missingCodes: item.missingCodes,
      text: item.text,
      valueLabels: item.valueLabels ?? null,
      counts: stored.itemCounts?.[item.itemId] ?? null,
    })),
    exclusions: row.exclusions,
  }, respondentLevel);
}
