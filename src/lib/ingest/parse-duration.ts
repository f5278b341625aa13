/**
 * Reads completion times: plain numbers in a stated unit, `mm:ss`, `hh:mm:ss` (fractions of a
 * second allowed), and ISO 8601 durations such as `PT5M30S`.
 */
import { parseNumber } from './parse-number';
import type { DurationUnit } from './types';

const UNIT_SECONDS: Readonly<Record<DurationUnit, number>> = { seconds: 1, minutes: 60, milliseconds: 0.001 };
const CLOCK = /^(\d+):([0-5]?\d)(?::([0-5]?\d))?(?:[.,](\d+))?$/;
const ISO = /^P(?:(\d+(?:[.,]\d+)?)D)?(?:T(?:(\d+(?:[.,]\d+)?)H)?(?:(\d+(?:[.,]\d+)?)M)?(?:(\d+(?:[.,]\d+)?)S)?)?$/i;

/**
 * Whether a cell is written as a clock time or an ISO 8601 duration (not a plain number).
 * @param cell cell text.
 * @returns true for `5:30`, `0:05:30`, `PT5M30S`.
 * References: ISO 8601-1:2019, "Date and time — Representations for information interchange — Part 1" (durations PnDTnHnMnS).
 */
export function looksLikeTimeText(cell: string): boolean {
  const text = cell.trim();
  return CLOCK.test(text) || (ISO.test(text) && text.length > 1 && !/^P$|T$/i.test(text));
}

/**
 * A completion time in seconds.
 * @param cell cell text.
 * @param unit the unit of plain numbers (seconds by default).
 * @param decimalSeparator the table's decimal separator.
 * @returns seconds (≥ 0), or NaN when the cell is blank, negative or unreadable. `12:30` is read
 *   as minutes and seconds (12 min 30 s), `1:02:03` as hours, minutes and seconds.
 * References: ISO 8601-1:2019, "Date and time — Representations for information interchange — Part 1" (durations PnDTnHnMnS).
 */
export function parseDuration(cell: string, unit: DurationUnit = 'seconds', decimalSeparator: '.' | ',' = '.'): number {
  const text = cell.trim();
  if (text === '') return Number.NaN;
  const clock = CLOCK.exec(text);
  if (clock) {
    const fraction = clock[4] === undefined ? 0 : Number(`0.${clock[4]}`);
    if (clock[3] === undefined) return Number(clock[1]) * 60 + Number(clock[2]) + fraction;
    return Number(clock[1]) * 3600 + Number(clock[2]) * 60 + Number(clock[3]) + fraction;
  }
  const iso = ISO.exec(text);
  if (iso && text.length > 1 && !/T$/i.test(text)) {
    const part = (value: string | undefined) => (value === undefined ? 0 : Number(value.replace(',', '.')));
    return part(iso[1]) * 86400 + part(iso[2]) * 3600 + part(iso[3]) * 60 + part(iso[4]);
  }
  const value = parseNumber(text, decimalSeparator);
  if (Number.isNaN(value) || value < 0) return Number.NaN;
  return value * UNIT_SECONDS[unit];
}
