/**
 * Checks a setup sent back by the setup form (or a script) against its table before a wave is
 * built. The setup is untrusted JSON: its shape is checked with zod, then its meaning.
 */
import { z } from 'zod';
import { columnPersonalData } from './column-profile';
import { tableColumnCodes, type CodedColumn } from './table-columns';
import type { WaveSetup, WaveTable } from './types';
import { WaveRefusal } from './wave-refusal';

const valueLabelSchema = z.object({ code: z.number(), label: z.string().trim().min(1) });

/** The shape of one item's setup; optional fields take their defaults. */
export const itemSetupSchema = z.object({
  id: z.string().trim().min(1).max(200),
  scale: z.string().trim().min(1).max(200).nullable().default(null),
  reverse: z.boolean().default(false),
  min: z.number(),
  max: z.number(),
  missingCodes: z.array(z.number()).default([]),
  text: z.string().nullable().default(null),
  labels: z.array(valueLabelSchema).default([]),
  missingLabels: z.array(z.string()).default([]),
  type: z.enum(['rating', 'scored', 'dichotomous']).optional(),
  facet: z.string().trim().max(200).nullable().optional(),
});

/** The shape of a setup: one entry per column named (others are ignored); extra keys are dropped. */
export const waveSetupSchema = z.object({
  columns: z.array(z.object({
    column: z.string(),
    role: z.enum(['item', 'respondent-id', 'outcome', 'duration', 'weight', 'ignore']),
    item: itemSetupSchema.nullable().default(null),
    durationUnit: z.enum(['seconds', 'minutes', 'milliseconds']).nullable().default(null),
  })),
});

declare const checkedSetup: unique symbol;

/**
 * A setup that {@link validateSetup} accepted for one table: the only kind `buildWave` takes, so
 * a setup is checked once per build and never again inside it.
 */
export type CheckedSetup = WaveSetup & { readonly [checkedSetup]: true };

function personalValues(header: string, column: CodedColumn, decimalSeparator: '.' | ','): string | null {
  // findPersonalData reads sampleCells(filled) only: the proposal's finding on the same sample is kept.
  const finding = columnPersonalData(header, column, decimalSeparator);
  return finding !== null && finding.fromValues ? finding.what : null;
}

/**
 * Validates a setup against its table.
 * @param table the table the setup describes.
 * @param setup untrusted JSON (a `WaveSetup`, or a `ProposedSetup` as proposed).
 * @throws {WaveRefusal} 400 with one of: `invalid-setup` (wrong shape), `unknown-column`,
 *   `duplicate-column-setup`, `two-respondent-ids`, `two-duration-columns`, `two-weight-columns`,
 *   `item-without-setup`, `invalid-range` (min ≥ max), `duplicate-item-id`, `no-items`,
 *   `personal-data-as-item` (a used column holds e-mail addresses, phone numbers or network addresses),
 *   `personal-data-as-id`.
 * @returns the setup with defaults filled in, marked as checked (see CheckedSetup).
 * References: Paredown api.md (400 for bad input; error shape).
 */
export function validateSetup(table: WaveTable, setup: unknown): CheckedSetup {
  const parsed = waveSetupSchema.safeParse(setup);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const where = issue.path.length > 0 ? ` at ${issue.path.join('.')}` : '';
    throw new WaveRefusal(400, 'invalid-setup', `The column setup is not valid${where} (${issue.message}); send one entry per column with its role and, for items, a range.`);
  }
  const result = parsed.data as WaveSetup;
  const columnIndex = new Map(table.headers.map((header, j) => [header, j]));
  const seen = new Set<string>();
  const itemIds = new Set<string>();
  const single: Record<string, string | undefined> = {};
  const singleCodes: Record<string, string> = { 'respondent-id': 'two-respondent-ids', duration: 'two-duration-columns', weight: 'two-weight-columns' };
  let items = 0;
  for (const entry of result.columns) {
    const j = columnIndex.get(entry.column);
    if (j === undefined) {
      throw new WaveRefusal(400, 'unknown-column', `The setup names the column "${entry.column}", which the file does not have; use the column names as proposed.`);
    }
    if (seen.has(entry.column)) {
      throw new WaveRefusal(400, 'duplicate-column-setup', `The setup lists the column "${entry.column}" twice; give each column one role.`);
    }
    seen.add(entry.column);
    if (entry.role in singleCodes) {
      const earlier = single[entry.role];
      if (earlier !== undefined) {
        throw new WaveRefusal(400, singleCodes[entry.role], `Both "${earlier}" and "${entry.column}" are set as the ${entry.role.replace('-', ' ')} column; choose one.`);
      }
      single[entry.role] = entry.column;
    }
    if (entry.role === 'ignore') continue;
    const personal = personalValues(entry.column, tableColumnCodes(table, j), table.source.decimalSeparator);
    if (personal !== null) {
      const code = entry.role === 'respondent-id' ? 'personal-data-as-id' : 'personal-data-as-item';
      throw new WaveRefusal(400, code, `The column "${entry.column}" holds ${personal}, which are personal data and are never stored as ${entry.role === 'respondent-id' ? 'respondent ids' : 'answers'}; set it to ignore.`);
    }
    if (entry.role === 'item' && entry.item === null) {
      throw new WaveRefusal(400, 'item-without-setup', `The item "${entry.column}" has no setup; give it at least an id and a range (min and max).`);
    }
    if ((entry.role === 'item' || entry.role === 'outcome') && entry.item !== null && !(entry.item.min < entry.item.max)) {
      throw new WaveRefusal(400, 'invalid-range', `The item "${entry.column}" has the range ${entry.item.min} to ${entry.item.max}; the minimum must be below the maximum.`);
    }
    if (entry.role === 'item' || entry.role === 'outcome') {
      const id = entry.item?.id ?? entry.column;
      if (itemIds.has(id)) {
        throw new WaveRefusal(400, 'duplicate-item-id', `Two columns use the item id "${id}"; give each item and outcome its own id.`);
      }
      itemIds.add(id);
    }
    if (entry.role === 'item') items++;
  }
  if (items === 0) {
    throw new WaveRefusal(400, 'no-items', 'The setup has no item columns; set at least one column as an item.');
  }
  return result as CheckedSetup;
}
