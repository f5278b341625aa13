import { useEffect, useState } from 'react';
import { driverModelApi, type DriverCoefficientView, type DriverModelResponse } from '../../lib/api/driver-model';
import { driverModelRowsNote, overlapSentences } from '../../lib/words/outcome';
import { ScrollRegion } from '../ScrollRegion';

/**
 * The driver model's panel: the coefficient table before and after the proposed cut, and each
 * item's standard error drawn as the part it would have without overlap plus the part overlap
 * adds (se = residual scale / (spread · sqrt(1 − R²_j))), before and after; one sentence per item
 * that overlap hurts. Loads only its slice (GET /api/audits/{id}/driver-model).
 */
export default function DriverModelPanel({ auditId }: { auditId: string }) {
  const [answer, setAnswer] = useState<DriverModelResponse | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    let live = true;
    void driverModelApi.get(auditId).then((result) => {
      if (!live) return;
      if (result.ok) setAnswer(result.data);
      else setProblem(result.error.message);
    });
    return () => {
      live = false;
    };
  }, [auditId]);

  if (problem) return <p className="notice" data-testid="driver-model-problem">{problem}</p>;
  if (!answer) return <p className="text-sm text-ink-soft">Loading the driver model…</p>;
  if (!answer.model) return <p className="text-sm text-ink-soft" data-testid="driver-model-none">{answer.note}</p>;

  const model = answer.model;
  const after = new Map((model.afterCut?.coefficients ?? []).map((coefficient) => [coefficient.term, coefficient]));
  const items = model.coefficients.filter((coefficient) => coefficient.term !== '(intercept)');
  const sentences = overlapSentences(
    items.map((coefficient) => ({ term: coefficient.term, vif: coefficient.vif, ratioAfterCut: model.afterCut ? after.get(coefficient.term)?.seRatio ?? null : null })),
  );

  return (
    <div className="grid gap-4" data-testid="driver-model">
      <p className="text-sm text-ink-soft">
        Outcome <strong className="text-ink">{model.outcome}</strong>: R² {fixed(model.r2)}, adjusted {fixed(model.adjR2)}
        {model.afterCut && (
          <>
            {' '}→ after the proposed cut (without {model.afterCut.removed.join(', ')}) R² {fixed(model.afterCut.r2)}, adjusted {fixed(model.afterCut.adjR2)}
          </>
        )}
        . {driverModelRowsNote(model.completeRows, model.respondentsUsed, model.missing)}
      </p>
      {sentences.length > 0 && (
        <ul className="list-disc space-y-0.5 pl-5 text-sm" data-testid="driver-model-sentences">
          {sentences.map((sentence) => (
            <li key={sentence}>{sentence}</li>
          ))}
        </ul>
      )}
      <StandardErrorBars items={items} after={after} hasCut={model.afterCut !== null} />
      <ScrollRegion label="Driver model coefficients">
        <table className="dense-table text-sm" data-testid="driver-model-table">
          <thead>
            <tr>
              <th scope="col">Term</th>
              {['Estimate', 'SE', 't', 'p', 'VIF', 'Relative weight', 'SE after cut', 'After / before'].map((label) => (
                <th key={label} scope="col" className="text-right">
                  {label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {model.coefficients.map((coefficient) => {
              const later = after.get(coefficient.term);
              const removed = model.afterCut?.removed.includes(coefficient.term) ?? false;
              return (
                <tr key={coefficient.term}>
                  <th scope="row" className="font-normal">{coefficient.term}</th>
                  <td className="text-right tabular-nums">{fixed(coefficient.estimate, 3)}</td>
                  <td className="text-right tabular-nums">{fixed(coefficient.se, 3)}</td>
                  <td className="text-right tabular-nums">{fixed(coefficient.t)}</td>
                  <td className="text-right tabular-nums">{pValue(coefficient.p)}</td>
                  <td className="text-right tabular-nums">{coefficient.aliased ? 'aliased' : fixed(coefficient.vif)}</td>
                  <td className="text-right tabular-nums">{fixed(coefficient.relativeWeight, 3)}</td>
                  <td className="text-right tabular-nums">{removed ? 'cut' : fixed(later?.se ?? null, 3)}</td>
                  <td className="text-right tabular-nums">{removed ? '' : fixed(later?.seRatio ?? null)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </ScrollRegion>
    </div>
  );
}

function fixed(value: number | null | undefined, digits = 2): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '–' : value.toFixed(digits);
}

function pValue(value: number | null): string {
  if (value === null) return '–';
  return value < 0.001 ? '< .001' : value.toFixed(3);
}

/** The bars: each item's SE as its own part plus the part overlap adds, before and after the cut. */
function StandardErrorBars({ items, after, hasCut }: { items: DriverCoefficientView[]; after: Map<string, DriverCoefficientView>; hasCut: boolean }) {
  const split = (coefficient: DriverCoefficientView | undefined) => {
    const factors = coefficient?.seFactors;
    if (!coefficient || coefficient.se === null || !factors) return null;
    const own = factors.residualScale / factors.spread;
    return { own, overlap: Math.max(0, coefficient.se - own), total: coefficient.se };
  };
  const rows = items.map((coefficient) => ({ term: coefficient.term, before: split(coefficient), after: hasCut ? split(after.get(coefficient.term)) : null }));
  const largest = Math.max(...rows.flatMap((row) => [row.before?.total ?? 0, row.after?.total ?? 0]), 1e-12);
  const rowHeight = hasCut ? 22 : 14;
  const labelWidth = 90;
  const width = 560;
  const plot = width - labelWidth - 10;
  const height = rows.length * rowHeight + 34;
  const bar = (y: number, parts: { own: number; overlap: number } | null, dim: boolean) =>
    parts && (
      <>
        <rect x={labelWidth} y={y} width={(parts.own / largest) * plot} height={8} fill={dim ? '#9aa7c9' : '#2e3a80'} />
        <rect x={labelWidth + (parts.own / largest) * plot} y={y} width={(parts.overlap / largest) * plot} height={8} fill={dim ? '#e5bf86' : '#b4621c'} />
      </>
    );
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} className="w-full max-w-3xl" role="img" aria-label="Each item's standard error: the part it would have without overlap, and the part overlap adds, before and after the proposed cut" data-testid="driver-model-bars">
        {rows.map((row, index) => {
          const y = 6 + index * rowHeight;
          return (
            <g key={row.term}>
              <text x={labelWidth - 6} y={y + 8} fontSize={9} textAnchor="end" fill="#1c2127">{row.term}</text>
              {bar(y, row.before, false)}
              {hasCut && (row.after ? bar(y + 10, row.after, true) : <text x={labelWidth + 2} y={y + 17} fontSize={8} fill="#5f6772">cut</text>)}
            </g>
          );
        })}
        <g transform={`translate(${labelWidth}, ${height - 14})`} fontSize={9} fill="#1c2127">
          <rect x={0} y={-7} width={10} height={8} fill="#2e3a80" />
          <text x={14} y={0}>without overlap (residual scale / the item's spread)</text>
          <rect x={250} y={-7} width={10} height={8} fill="#b4621c" />
          <text x={264} y={0}>added by overlap{hasCut ? '; paler bars: after the cut' : ''}</text>
        </g>
      </svg>
      <figcaption className="mt-1 text-xs text-ink-faint">
        A bar's length is the item's standard error. Dividing it by the part without overlap gives sqrt(VIF), the factor in the sentences above.
      </figcaption>
    </figure>
  );
}
