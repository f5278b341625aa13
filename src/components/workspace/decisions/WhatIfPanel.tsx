import type { CutListConstraints, WhatIfResponse } from '../../../lib/api/cut-list';
import { formatNumber, reliabilityBasisNote } from '../../../lib/words';
import { beforeAfter, constraintBreaches, minutesWords } from './decision-words';

interface Props {
  whatIf: WhatIfResponse | null;
  state: 'idle' | 'busy' | 'error';
  error: string | null;
  constraints: CutListConstraints;
  hasAudit: boolean;
}

/**
 * The live what-if of the current decisions: what a fresh audit of the remaining items would show
 * (largest VIF, condition number, each scale's alpha and omega with the Spearman-Brown
 * projection), items removed and minutes saved, and the constraints the decisions would break.
 */
export default function WhatIfPanel({ whatIf, state, error, constraints, hasAudit }: Props) {
  const breaches = constraintBreaches(whatIf, constraints);
  const breached = new Set(breaches.map((breach) => breach.scale));
  // A null VIF or condition number is infinite: an exact dependency (a copied column) in the item set.
  const singularBefore = whatIf !== null && whatIf.maxVifBefore === null;
  const singularAfter = whatIf !== null && whatIf.maxVif === null && whatIf.scales.some((scale) => scale.items > 0);
  return (
    <section className="panel p-4" aria-labelledby="what-if-heading" aria-busy={state === 'busy'} data-testid="what-if">
      <div className="mb-2 flex items-baseline gap-2">
        <h2 id="what-if-heading" className="font-semibold">What if</h2>
        <span className="text-xs text-ink-faint">the current decisions, recomputed</span>
        <span className={`ml-auto text-xs ${state === 'busy' ? 'text-spruce-700' : 'text-ink-faint'}`} data-testid="what-if-state">
          {state === 'busy' ? 'Updating…' : whatIf ? `${formatNumber(whatIf.computeMs, 0)} ms` : ''}
        </span>
      </div>
      {!hasAudit ? (
        <div className="empty-state">The what-if needs a finished audit.</div>
      ) : state === 'error' ? (
        <p className="error-text" role="alert">{error}</p>
      ) : !whatIf ? (
        <p className="text-sm text-ink-soft">Computing…</p>
      ) : (
        <>
          <dl className="grid grid-cols-2 gap-2 text-sm" data-testid="what-if-figures">
            <div className="rounded border border-rule px-2 py-1.5">
              <dt className="text-xs text-ink-faint">Items removed</dt>
              <dd className="num text-left text-xl font-bold" data-testid="what-if-removed">{whatIf.itemsRemoved}</dd>
            </div>
            <div className="rounded border border-rule px-2 py-1.5">
              <dt className="text-xs text-ink-faint">Time saved</dt>
              <dd className="num text-left text-xl font-bold">{minutesWords(whatIf.minutesSaved)}</dd>
            </div>
            <div className="rounded border border-rule px-2 py-1.5">
              <dt className="text-xs text-ink-faint">Largest VIF</dt>
              <dd className="num text-left font-semibold" data-testid="what-if-vif">{beforeAfter(whatIf.maxVifBefore, whatIf.maxVif, 1, singularBefore, singularAfter)}</dd>
            </div>
            <div className="rounded border border-rule px-2 py-1.5">
              <dt className="text-xs text-ink-faint">Condition number</dt>
              <dd className="num text-left font-semibold">{beforeAfter(whatIf.conditionNumberBefore, whatIf.conditionNumber, 1, singularBefore, singularAfter)}</dd>
            </div>
          </dl>
          <table className="dense-table mt-3 text-sm" data-testid="what-if-scales">
            <caption className="text-left text-xs text-ink-soft">{reliabilityBasisNote(null)}</caption>
            <thead>
              <tr>
                <th scope="col">Scale</th>
                <th scope="col" className="num">Items</th>
                <th scope="col" className="num">Alpha</th>
                <th scope="col" className="num whitespace-nowrap" title="Spearman-Brown projection of the old alpha to the new length">S-B</th>
                <th scope="col" className="num">Omega</th>
              </tr>
            </thead>
            <tbody>
              {whatIf.scales.map((scale) => (
                <tr key={scale.id} className={breached.has(scale.id) ? 'bg-ochre-50' : undefined}>
                  <td className="font-semibold">{scale.id}</td>
                  <td className="num whitespace-nowrap">{scale.items === scale.itemsBefore ? scale.items : `${scale.itemsBefore}→${scale.items}`}</td>
                  <td className="num whitespace-nowrap">{scale.items === scale.itemsBefore ? formatNumber(scale.alpha, 2) : `${formatNumber(scale.alphaBefore, 2)}→${formatNumber(scale.alpha, 2)}`}</td>
                  <td className="num">{scale.items === scale.itemsBefore ? '' : formatNumber(scale.spearmanBrown, 2)}</td>
                  <td className="num">{formatNumber(scale.omega, 2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {whatIf.driverModel && (
            <div className="mt-3 text-sm" data-testid="what-if-driver-model">
              <p className="text-ink-soft">
                Driver model of <strong className="text-ink">{whatIf.driverModel.outcome}</strong>:{' '}
                {whatIf.driverModel.afterDecisions
                  ? `R² ${formatNumber(whatIf.driverModel.r2Before, 2)}→${formatNumber(whatIf.driverModel.afterDecisions.r2, 2)} on the same ${whatIf.driverModel.afterDecisions.n} respondents.`
                  : 'these decisions remove none of its predictors.'}
              </p>
              {whatIf.driverModel.afterDecisions && (
                <ul className="mt-1 list-disc pl-4 text-xs text-ink-soft">
                  {[...whatIf.driverModel.afterDecisions.coefficients]
                    .filter((c) => c.term !== '(intercept)' && c.seRatio !== null && c.seRatio < 0.95)
                    .sort((a, b) => (a.seRatio ?? 1) - (b.seRatio ?? 1))
                    .slice(0, 5)
                    .map((c) => (
                      <li key={c.term}>
                        {c.term}: standard error down to {Math.round((c.seRatio ?? 1) * 100)}% of what it was
                      </li>
                    ))}
                </ul>
              )}
            </div>
          )}
          {breaches.length > 0 && (
            <ul className="notice mt-3 space-y-0.5 text-sm" data-testid="what-if-breaches">
              {breaches.map((breach) => <li key={breach.message}>{breach.message}</li>)}
            </ul>
          )}
          {whatIf.warnings.length > 0 && (
            <details className="mt-2 text-xs text-ink-soft">
              <summary className="cursor-pointer">{whatIf.warnings.length} {whatIf.warnings.length === 1 ? 'note' : 'notes'} on the reduced item set</summary>
              <ul className="mt-1 list-disc pl-4">{whatIf.warnings.map((w) => <li key={`${w.code}-${w.message}`}>{w.message}</li>)}</ul>
            </details>
          )}
          {(singularBefore || singularAfter) && (
            <p className="mt-2 text-xs text-ink-faint" data-testid="what-if-singular">
              ∞: {singularAfter ? 'an exact copy of a column is still among the items kept, so the matrix stays singular; drop or merge one of the copies.' : 'before the cut, an exact copy of a column makes the matrix singular.'}
            </p>
          )}
        </>
      )}
    </section>
  );
}
