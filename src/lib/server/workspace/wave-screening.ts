/**
 * The screening of an audited wave as aggregates (counts and messages, never respondent rows),
 * for the audit page's "which respondents the figures use" panel.
 */
import { eq } from 'drizzle-orm';
import { waves } from '../../../db/schema';
import type { ScreeningResult } from '../../ingest';
import { getDb } from '../db';
import { screeningSummary } from '../waves/stored-wave';

/**
 * The wave's screening counts.
 * @param waveId the wave.
 * @returns respondents in the wave, how many are set aside now, and each flag's count and message; null without a wave.
 */
export function waveScreeningCounts(waveId: string): { respondents: number; excluded: number; flags: { code: string; count: number; message: string }[] } | null {
  const wave = getDb().select({ screening: waves.screening, exclusions: waves.exclusions, rowCount: waves.rowCount }).from(waves).where(eq(waves.id, waveId)).get();
  if (!wave) return null;
  const summary = screeningSummary((wave.screening ?? null) as ScreeningResult | null);
  return {
    respondents: wave.rowCount,
    excluded: wave.exclusions.length,
    flags: (summary?.flags ?? []).map(({ code, count, message }) => ({ code, count, message })),
  };
}
