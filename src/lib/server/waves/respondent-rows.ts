/**
 * Respondent-level rows of a confirmed wave with their screening flags, a page at a time. Only
 * owners and designers reach this (permission read:respondents); reviewers never do.
 */
import type { ScreeningFlag, ScreeningResult } from '../../ingest';
import { fail } from '../errors';
import { flagsByRow, parseStoredSetup, type WaveRow } from './stored-wave';
import type { RespondentPage } from '../../api/waves';
export type { RespondentPage, RespondentRow } from '../../api/waves';

/** Which respondents to list. */
export interface RespondentQuery {
  page: number;
  perPage: number;
  /** Only respondents with at least one screening flag. */
  flagged: boolean;
  /** Only excluded respondents. */
  excluded: boolean;
}

/**
 * A page of respondents of a confirmed wave.
 * @param row the wave row.
 * @param query page (1-based), rows per page, filters.
 * @throws HttpError 409 `wave-not-confirmed` while the wave is still proposed.
 * @returns the page.
 * References: Paredown api.md (GET /api/waves/{id}/respondents); methods.md §6 (screening flags).
 */
export function respondentPage(row: WaveRow, query: RespondentQuery): RespondentPage {
  if (row.status !== 'confirmed') {
    throw fail.conflict(`"${row.label}" is not confirmed yet; confirm its column setup first.`, 'wave-not-confirmed');
  }
  const screening = (row.screening ?? null) as ScreeningResult | null;
  const stored = parseStoredSetup(row.setup, row.rowCount);
  const flags = screening ? flagsByRow(screening) : new Map<number, ScreeningFlag['code'][]>();
  const excluded = new Set(row.exclusions);
  const proposed = new Set(screening?.proposedExclusions ?? []);
  let rows: number[] = Array.from({ length: row.rowCount }, (_, i) => i);
  if (query.flagged) rows = rows.filter((i) => flags.has(i));
  if (query.excluded) rows = rows.filter((i) => excluded.has(i));
  const total = rows.length;
  const pages = Math.max(1, Math.ceil(total / query.perPage));
  const slice = rows.slice((query.page - 1) * query.perPage, query.page * query.perPage);
  return {
    waveId: row.id,
    page: query.page,
    perPage: query.perPage,
    total,
    pages,
    respondents: slice.map((i) => ({
      row: i,
      respondentId: row.respondentIds?.[i] ?? null,
      excluded: excluded.has(i),
      proposed: proposed.has(i),
      flags: flags.get(i) ?? [],
      longString: screening?.longString[i] ?? null,
      withinSd: screening?.withinSd[i] ?? null,
      missingShare: screening?.missingShare[i] ?? null,
      duration: screening?.duration?.[i] ?? null,
      weight: stored.weight?.[i] ?? null,
      outcomes: Object.fromEntries((stored.outcomes ?? []).map((outcome) => [outcome.id, outcome.values[i] ?? null])),
    })),
  };
}
