/**
 * One opened pair of the overlap map: both items' wording, r with its interval and n, the
 * evidence, the recommendations that involve either item, and the crosstab of their answers
 * (GET /api/audits/{id}/crosstab), with small cells withheld for roles that may not read
 * respondent rows.
 */
import { useEffect, useRef, useState } from 'react';
import { callApi } from '../../lib/api/client';
import type { Crosstab, OverlapMap, OverlapMapPair } from '../../lib/api/overlap-map';
import { HoverCard } from './PairFigures';
import { ScrollRegion } from '../ScrollRegion';

const actionWords: Record<string, string> = { drop: 'drop', merge: 'merge into', reword: 'reword', keep: 'keep' };

export default function PairDetail({ auditId, data, a, b, evidence, onClose }: { auditId: string; data: OverlapMap; a: number; b: number; evidence: OverlapMapPair | null; onClose: () => void }) {
  const [crosstab, setCrosstab] = useState<Crosstab | null>(null);
  const [problem, setProblem] = useState('');
  const heading = useRef<HTMLHeadingElement>(null);
  const first = data.items[a];
  const second = data.items[b];

  useEffect(() => {
    let stopped = false;
    void callApi<Crosstab>('GET', `/api/audits/${auditId}/crosstab?a=${encodeURIComponent(first.id)}&b=${encodeURIComponent(second.id)}`).then((result) => {
      if (stopped) return;
      if (result.ok) setCrosstab(result.data);
      else setProblem(result.error.message);
    });
    return () => {
      stopped = true;
    };
  }, [auditId, first.id, second.id]);

  const involved = data.recommendations
    .filter((recommendation) => recommendation.cluster.includes(first.id) || recommendation.cluster.includes(second.id))
    .sort((x, y) => Number(y.cluster.includes(first.id) && y.cluster.includes(second.id)) - Number(x.cluster.includes(first.id) && x.cluster.includes(second.id)));
  const cluster = data.clusters.findIndex((c) => c.items.includes(a) && c.items.includes(b));

  return (
    <section className="panel grid gap-4 p-4" aria-labelledby={`pair-heading-${a}-${b}`} data-testid="pair-detail">
      <div className="flex flex-wrap items-baseline gap-3">
        <h3 id={`pair-heading-${a}-${b}`} ref={heading} className="text-base font-semibold">
          {first.id} and {second.id}
        </h3>
        <button type="button" className="button button-quiet ml-auto" onClick={onClose}>
          Close the pair
        </button>
      </div>
      <div className="grid grid-cols-[minmax(0,1fr)] gap-4 md:grid-cols-2">
        <HoverCard data={data} i={a} j={b} evidence={evidence} cluster={cluster >= 0 ? cluster : null} />
        <div className="grid content-start gap-2 text-sm" data-testid="pair-recommendations">
          <h4 className="font-semibold">What the audit proposes</h4>
          {involved.length === 0 && <p className="text-ink-soft">No recommendation involves either item.</p>}
          {involved.map((recommendation) => (
            <div key={recommendation.index} className="rounded border border-rule p-2">
              <p className="text-xs text-ink-faint">
                Proposal {recommendation.index + 1} · cluster {recommendation.cluster.join(', ')}
                {recommendation.unstable && ' · unstable'}
              </p>
              <p className="mt-1">{recommendation.reason}</p>
              <ul className="mt-1 text-ink-soft">
                <li>Keep {recommendation.keep}</li>
                {recommendation.actions
                  .filter((action) => action.action !== 'keep')
                  .map((action) => (
                    <li key={action.item}>
                      {action.item}: {actionWords[action.action] ?? action.action} {action.into ?? ''}
                    </li>
                  ))}
              </ul>
            </div>
          ))}
        </div>
      </div>
      <div className="min-w-0" data-testid="pair-crosstab">
        <h4 className="mb-1 text-sm font-semibold">How the answers cross</h4>
        {problem && <p className="error-text" role="alert">{problem}</p>}
        {!crosstab && !problem && <p className="text-sm text-ink-soft">Counting the answers…</p>}
        {crosstab && <CrosstabTable crosstab={crosstab} />}
      </div>
    </section>
  );
}

function valueLabel(value: number, label: string | null): string {
  return label ? `${value} ${label}` : String(value);
}

function CrosstabTable({ crosstab }: { crosstab: Crosstab }) {
  const [rows, columns] = crosstab.items;
  const largest = Math.max(1, ...crosstab.counts.flat().map((count) => count ?? 0));
  return (
    <div className="grid gap-1">
      <ScrollRegion label="Crosstab of the pair">
        <table className="dense-table w-auto" data-testid="crosstab-table">
          <caption className="pb-1 text-left text-xs text-ink-soft">
            Rows: {rows.id}{rows.reverse ? ' (reverse-keyed, flipped)' : ''}; columns: {columns.id}{columns.reverse ? ' (reverse-keyed, flipped)' : ''}. Respondents who answered both.
          </caption>
          <thead>
            <tr>
              <th scope="col">
                {rows.id} \ {columns.id}
              </th>
              {columns.values.map((value, k) => (
                <th key={value} scope="col" className="num">
                  {valueLabel(value, columns.labels[k])}
                </th>
              ))}
              {crosstab.rowTotals && <th scope="col" className="num">Total</th>}
            </tr>
          </thead>
          <tbody>
            {crosstab.counts.map((row, i) => (
              <tr key={rows.values[i]}>
                <th scope="row" className="normal-case tracking-normal">
                  {valueLabel(rows.values[i], rows.labels[i])}
                </th>
                {row.map((count, j) => (
                  <td key={columns.values[j]} className="num" style={{ background: count ? `rgba(23, 86, 74, ${(0.28 * count) / largest})` : undefined }}>
                    {count === null ? <span title={`Fewer than ${crosstab.suppressedBelow} respondents`}>&lt;{crosstab.suppressedBelow}</span> : count}
                  </td>
                ))}
                {crosstab.rowTotals && <td className="num font-semibold">{crosstab.rowTotals[i]}</td>}
              </tr>
            ))}
            {crosstab.columnTotals && (
              <tr>
                <th scope="row">Total</th>
                {crosstab.columnTotals.map((total, j) => (
                  <td key={columns.values[j]} className="num font-semibold">
                    {total}
                  </td>
                ))}
                <td className="num font-semibold">{crosstab.answeredBoth}</td>
              </tr>
            )}
          </tbody>
        </table>
      </ScrollRegion>
      <p className="text-xs text-ink-faint" data-testid="crosstab-note">
        {crosstab.answeredBoth} of the {crosstab.respondents} respondents the audit used answered both; {crosstab.missingEither} missed one or both.
        {crosstab.suppressedCells > 0 && ` ${crosstab.suppressedCells} small ${crosstab.suppressedCells === 1 ? 'cell is' : 'cells are'} withheld (fewer than ${crosstab.suppressedBelow} respondents, or needed to keep one from being worked out), and the totals with them: your role sees aggregates only.`}
        {crosstab.exclusionsChanged && ' The wave\u2019s set-aside respondents changed after this audit ran: these counts use the rows set aside now.'}
      </p>
    </div>
  );
}
