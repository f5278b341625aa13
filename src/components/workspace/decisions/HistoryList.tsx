import { useState } from 'react';
import type { HistoryEntry } from '../../../lib/api/cut-list';
import { formatDayAndTime } from '../../date-words';
import { decisionPhrase } from './decision-words';

/** Entries shown before "show all". */
const FIRST_ENTRIES = 12;

/** Every change of the study's decisions, newest first: who, when, from what to what, why. */
export default function HistoryList({ history }: { history: HistoryEntry[] }) {
  const [all, setAll] = useState(false);
  const shown = all ? history : history.slice(0, FIRST_ENTRIES);
  return (
    <section className="panel mt-5 p-4" aria-labelledby="history-heading" data-testid="decision-history">
      <div className="mb-2 flex flex-wrap items-baseline gap-x-3">
        <h2 id="history-heading" className="font-semibold">History</h2>
        <span className="text-xs text-ink-faint">every change, newest first</span>
      </div>
      {history.length === 0 ? (
        <div className="empty-state">No decision recorded yet.</div>
      ) : (
        <>
          <ol className="divide-y divide-rule text-sm">
            {shown.map((entry) => (
              <li key={entry.id} className="flex flex-wrap gap-x-3 gap-y-0.5 py-1.5" data-testid="history-entry">
                <span className="w-36 shrink-0 whitespace-nowrap text-ink-faint">{formatDayAndTime(entry.at)}</span>
                <span className="min-w-0 flex-1">
                  <code>{entry.itemId}</code>: {decisionPhrase(entry.from, null)} → <strong>{decisionPhrase(entry.to, entry.into)}</strong>
                  {entry.wording && <> (“{entry.wording}”)</>}
                  {entry.reason && <span className="text-ink-soft"> — {entry.reason}</span>}
                </span>
                <span className="shrink-0 text-ink-soft">{entry.by?.name ?? 'a former member'}</span>
              </li>
            ))}
          </ol>
          {history.length > FIRST_ENTRIES && (
            <button type="button" className="button button-quiet mt-2 py-1 text-sm" onClick={() => setAll(!all)}>
              {all ? 'Show the latest only' : `Show all ${history.length} changes`}
            </button>
          )}
        </>
      )}
    </section>
  );
}
