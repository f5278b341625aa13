/**
 * The parsed result of a done audit, kept per process: a done audit's result is never written
 * again (retry runs only failed or cancelled audits; a restore refuses a database a server holds
 * open), so every page and route that reads it shares one parsed copy instead of reading and
 * parsing its JSON (hundreds of kilobytes) on every request. The copy is frozen, deeply: a caller
 * that tried to change it would throw rather than change what every later request sees.
 * Bounded by count and by the length of the JSON held, least recently used first out.
 * docs/decisions/023-page-cost.md.
 */
import { and, eq } from 'drizzle-orm';
import { audits } from '../../../db/schema';
import type { Db } from '../../../db/client';
import type { AuditJson } from '../../audit/audit-json';

/** At most this many results are kept. */
export const DONE_RESULTS_KEPT = 16;
/** At most this many characters of JSON are kept in all (the parsed objects take a few times more). */
export const DONE_RESULTS_MAX_CHARACTERS = 32_000_000;

interface Kept {
  result: AuditJson;
  characters: number;
}

const kept = new Map<string, Kept>();
let keptCharacters = 0;

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const key of Object.keys(value)) deepFreeze((value as Record<string, unknown>)[key]);
  }
  return value;
}

/**
 * The parsed, frozen result of a done audit, read and parsed once per process.
 * The caller checks access and status as before; this only reads.
 * @param db the database.
 * @param auditId the audit.
 * @returns the result, or null when there is no such audit or it is not done.
 */
export function doneAuditResult(db: Db, auditId: string): AuditJson | null {
  const hit = kept.get(auditId);
  if (hit) {
    // Most recently used last.
    kept.delete(auditId);
    kept.set(auditId, hit);
    return hit.result;
  }
  const text = db.select({ result: audits.result }).from(audits).where(and(eq(audits.id, auditId), eq(audits.status, 'done'))).get()?.result;
  if (!text) return null;
  const entry: Kept = { result: deepFreeze(JSON.parse(text) as AuditJson), characters: text.length };
  kept.set(auditId, entry);
  keptCharacters += entry.characters;
  for (const [id, old] of kept) {
    if (kept.size <= DONE_RESULTS_KEPT && keptCharacters <= DONE_RESULTS_MAX_CHARACTERS) break;
    if (id === auditId) break;
    kept.delete(id);
    keptCharacters -= old.characters;
  }
  return entry.result;
}

/** How many results are kept now (for tests). */
export function doneAuditResultsKept(): number {
  return kept.size;
}
