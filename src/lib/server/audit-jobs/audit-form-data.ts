/**
 * What a form that starts an audit needs to know about a wave: its items (to lock some), its
 * outcome columns, and the settings an audit takes when nothing is changed. Aggregates only: no
 * respondent-level data.
 */
import { and, eq, sql } from 'drizzle-orm';
import { preparedQuery } from '../../../db/prepared-query';
import { waveItems, waves } from '../../../db/schema';
import { getDb } from '../db';
import type { StudyRow } from '../guard';
import { parseStoredSetup, type WaveRow } from '../waves/stored-wave';
import { defaultAuditSettings } from './audit-settings';
import type { AuditFormWave } from '../../api/audits';
export type { AuditFormWave } from '../../api/audits';

/** The columns of a wave row the form needs (no matrix). */
export type FormWaveRow = Pick<WaveRow, 'id' | 'label' | 'status' | 'setup' | 'rowCount' | 'exclusions'>;

// Read on every designer's study page: built once (src/db/prepared-query.ts).
const itemsOfWave = preparedQuery((db) =>
  db
    .select({ id: waveItems.itemId, scale: waveItems.scale, text: waveItems.text })
    .from(waveItems)
    .where(eq(waveItems.waveId, sql.placeholder('waveId')))
    .orderBy(waveItems.position)
    .prepare(),
);
const confirmedWavesOf = preparedQuery((db) =>
  db
    .select({ id: waves.id, label: waves.label, status: waves.status, setup: waves.setup, rowCount: waves.rowCount, exclusions: waves.exclusions })
    .from(waves)
    .where(and(eq(waves.studyId, sql.placeholder('studyId')), eq(waves.status, 'confirmed')))
    .orderBy(waves.createdAt)
    .prepare(),
);

/**
 * The form data of a wave.
 * @param study the wave's study (its constraints and locked items are the defaults).
 * @param wave the wave row.
 * @returns items, outcomes and default settings.
 */
export function auditFormWave(study: StudyRow, wave: FormWaveRow): AuditFormWave {
  const items = itemsOfWave(getDb()).all({ waveId: wave.id });
  const outcomes = (parseStoredSetup(wave.setup, wave.rowCount).outcomes ?? []).map(({ id, header }) => ({ id, header }));
  const defaults = defaultAuditSettings(study.settings);
  const itemIds = new Set(items.map((item) => item.id));
  return {
    id: wave.id,
    label: wave.label,
    status: wave.status,
    respondents: wave.rowCount,
    excluded: wave.exclusions.length,
    items,
    outcomes,
    defaults: { ...defaults, locked: defaults.locked.filter((id) => itemIds.has(id)) },
  };
}

/**
 * The form data of every confirmed wave of a study, oldest first.
 * @param study the study.
 * @returns one entry per confirmed wave.
 */
export function confirmedFormWaves(study: StudyRow): AuditFormWave[] {
  return confirmedWavesOf(getDb())
    .all({ studyId: study.id })
    .map((wave) => auditFormWave(study, wave));
}

