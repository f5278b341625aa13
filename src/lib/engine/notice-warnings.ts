/**
 * The core's notices as the engine's warnings: item positions in the matrix a core function saw
 * become the items' ids.
 */
import type { NumericalNotice } from '../stats/types';
import type { EngineItem, EngineWarning } from './types';

/**
 * Turns notices of a core function (item indices local to the matrix it saw) into warnings with
 * item ids. `local[k]` is the index into items[] of the matrix's k-th item. An exact-dependency
 * notice gets a sentence naming the items by id (the core's sentence counts local columns).
 * @param notices The core's notices.
 * @param items All items of the audit.
 * @param local Map from the core matrix's columns to indices into items[].
 * @param context Prefix for the message (e.g. "Scale S1"), or empty.
 * @returns One warning per notice.
 * References: none (a change of vocabulary, not a method).
 */
export function warningsFromNotices(notices: readonly NumericalNotice[], items: readonly EngineItem[], local: readonly number[], context = ''): EngineWarning[] {
  return notices.map((notice) => {
    const ids = notice.items.map((k) => items[local[k]]?.id).filter((id): id is string => id !== undefined);
    let message = namePositions(notice.message, local.map((j) => items[j]?.id ?? String(j)));
    if (notice.code === 'exact-dependency' && ids.length > 0 && ids.length < local.length) {
      message = `${ids.join(', ')} are exactly linearly dependent (one is an exact linear combination of the others, e.g. a duplicated column): their VIF and condition index are infinite and reported as null.`;
    }
    return { code: notice.code, items: ids, message: context.length > 0 ? `${context}: ${message}` : message };
  });
}

/**
 * The core names items by their 0-based position in the matrix it was given ("item 3",
 * "Predictor 2", "item column 4", "Items at columns 0, 5"); a reader needs the item ids.
 * @param message a core notice's message.
 * @param ids the ids of the matrix's columns, in order.
 * @returns the message with every position replaced by its id.
 * References: none (a change of vocabulary, not a method).
 */
export function namePositions(message: string, ids: readonly string[]): string {
  const id = (position: string): string => ids[Number(position)] ?? `#${Number(position) + 1}`;
  return message
    .replace(/\b(I|i)tems at columns ((?:\d+)(?:, \d+)*)/g, (_, initial: string, list: string) => `${initial}tems ${list.split(', ').map(id).join(', ')}`)
    .replace(/\b(I|i)tem column (\d+)/g, (_, initial: string, position: string) => `${initial}tem ${id(position)}`)
    .replace(/\b([Ii]tem|[Pp]redictor) (\d+)\b/g, (_, word: string, position: string) => `${word} ${id(position)}`);
}
