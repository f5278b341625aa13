import { useState } from 'react';
import type { ScreeningDetail } from '../../lib/api/waves';

/** Words for each screening flag. */
export const flagWords: Record<string, { title: string; short: string }> = {
  'long-string': { title: 'Straightlining: long runs', short: 'long run' },
  'low-variability': { title: 'Straightlining: one answer throughout', short: 'no variation' },
  speeder: { title: 'Speeders', short: 'speeder' },
  'mostly-missing': { title: 'Mostly empty', short: 'mostly empty' },
};

/** Rows shown at once in the list of flagged respondents. */
const SHOWN_AT_ONCE = 200;

/**
 * The screening summary: each flag with its count, and the respondents proposed for exclusion,
 * which the designer keeps or changes before the wave is stored.
 */
export default function ScreeningStep({
  screening,
  excluded,
  onChange,
  headingLevel = 3,
}: {
  screening: ScreeningDetail;
  excluded: ReadonlySet<number>;
  onChange: (next: Set<number>) => void;
  /** The level of its "Flagged respondents" heading: one below the heading it sits under (3 in the upload's screening step, 2 on a page of its own). */
  headingLevel?: 2 | 3;
}) {
  const FlaggedHeading = headingLevel === 2 ? 'h2' : 'h3';
  const [showAll, setShowAll] = useState(false);
  const flagged = screening.flagged;
  const rowsOf = (code: string) => flagged.filter((respondent) => respondent.flags.includes(code as never)).map((respondent) => respondent.row);

  function setMany(rows: number[], exclude: boolean) {
    const next = new Set(excluded);
    for (const row of rows) {
      if (exclude) next.add(row);
      else next.delete(row);
    }
    onChange(next);
  }

  const shown = showAll ? flagged : flagged.slice(0, SHOWN_AT_ONCE);
  const time = (seconds: number | null) => (seconds === null ? '–' : seconds >= 60 ? `${Math.floor(seconds / 60)} min ${Math.round(seconds % 60)} s` : `${Math.round(seconds)} s`);
  return (
    <div className="space-y-5">
      <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4" aria-label="Screening flags">
        {screening.flags.map((flag) => {
          const rows = rowsOf(flag.code);
          const all = rows.length > 0 && rows.every((row) => excluded.has(row));
          return (
            <li key={flag.code} className="panel p-3" data-testid={`flag-${flag.code}`}>
              <div className="text-sm font-semibold text-ink-soft">{flagWords[flag.code]?.title ?? flag.code}</div>
              <div className="num text-left text-3xl font-bold text-ink" data-testid="flag-count">{flag.count}</div>
              <p className="mt-1 text-xs leading-snug text-ink-soft">{flag.message}</p>
              {rows.length > 0 && (
                <label className="mt-2 flex items-center gap-2 text-sm">
                  <input type="checkbox" className="h-4 w-4 accent-spruce-700" checked={all} onChange={(event) => setMany(rows, event.target.checked)} />
                  Exclude all {rows.length}
                </label>
              )}
            </li>
          );
        })}
      </ul>
      {screening.medianDuration !== null && (
        <p className="text-sm text-ink-soft">Median completion time: <span className="font-semibold text-ink">{time(screening.medianDuration)}</span>.</p>
      )}

      <section aria-labelledby="flagged-heading">
        <div className="mb-2 flex flex-wrap items-baseline gap-3">
          <FlaggedHeading id="flagged-heading" className="font-semibold">Flagged respondents</FlaggedHeading>
          <span className="text-sm text-ink-soft" data-testid="exclusion-tally">
            {excluded.size} of {screening.respondents} respondents will be left out of audits
          </span>
          <span className="ml-auto flex gap-2">
            <button type="button" className="button button-quiet py-1 text-sm" onClick={() => onChange(new Set(screening.proposedExclusions))}>Use the proposal</button>
            <button type="button" className="button button-quiet py-1 text-sm" onClick={() => onChange(new Set())}>Exclude no one</button>
          </span>
        </div>
        {flagged.length === 0 ? (
          <div className="empty-state">No respondent is flagged. Everyone goes into the audits.</div>
        ) : (
          <div className="panel max-h-[26rem] overflow-auto">
            <table className="dense-table text-sm" data-testid="flagged-table">
              <thead>
                <tr>
                  <th scope="col">Exclude</th>
                  <th scope="col" className="num">Row</th>
                  <th scope="col">Respondent id</th>
                  <th scope="col">Flags</th>
                  <th scope="col" className="num">Time</th>
                </tr>
              </thead>
              <tbody>
                {shown.map((respondent) => (
                  <tr key={respondent.row} data-testid="flagged-row">
                    <td>
                      <input
                        type="checkbox"
                        className="h-4 w-4 accent-spruce-700"
                        aria-label={`Exclude respondent ${respondent.respondentId ?? `in row ${respondent.row + 1}`}`}
                        checked={excluded.has(respondent.row)}
                        onChange={(event) => setMany([respondent.row], event.target.checked)}
                      />
                    </td>
                    <td className="num">{respondent.row + 1}</td>
                    <td className="font-mono text-[0.8125rem]">{respondent.respondentId ?? '–'}</td>
                    <td>
                      <span className="flex flex-wrap gap-1">
                        {respondent.flags.map((flag) => <span key={flag} className="chip">{flagWords[flag]?.short ?? flag}</span>)}
                      </span>
                    </td>
                    <td className="num">{time(respondent.duration)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            {!showAll && flagged.length > SHOWN_AT_ONCE && (
              <p className="p-3 text-sm">
                {flagged.length - SHOWN_AT_ONCE} more flagged.{' '}
                <button type="button" className="font-semibold text-spruce-700 underline" onClick={() => setShowAll(true)}>Show all</button>
              </p>
            )}
          </div>
        )}
        <p className="mt-2 text-xs text-ink-faint">Row: the respondent's place among the wave's respondents, counting from 1.</p>
      </section>
    </div>
  );
}
