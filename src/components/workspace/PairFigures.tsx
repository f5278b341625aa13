/**
 * The figures of one pair of the overlap map, shown on hover and in the opened pair: both items'
 * wording and scale, r with its interval and n, and the evidence the audit has for the pair.
 */
import { mapCorrelation, mapInterval, mapPairN, type OverlapMap as OverlapMapData, type OverlapMapPair } from '../../lib/api/overlap-map';

/** A correlation or similar figure with a true minus sign, or a dash when absent. */
export function formatR(value: number | null, digits = 2): string {
  return value === null ? '—' : value.toFixed(digits).replace('-', '−');
}
const format = formatR;

/** The hovered pair: both items, r with its interval and n, and the evidence the audit has. */
export function HoverCard({ data, i, j, evidence, cluster }: { data: OverlapMapData; i: number; j: number; evidence: OverlapMapPair | null; cluster: number | null }) {
  const r = mapCorrelation(data, i, j);
  const n = evidence?.n ?? mapPairN(data, i, j);
  const interval = evidence && evidence.lower !== null && evidence.upper !== null ? { lower: evidence.lower, upper: evidence.upper } : mapInterval(r, n, data.confidenceLevel);
  const items = [data.items[i], data.items[j]];
  return (
    <div className="grid gap-2" data-testid="hover-card">
      {items.map((item) => (
        <div key={item.id}>
          <div className="font-semibold">
            {item.id} {item.scale && <span className="font-normal text-ink-faint">· {item.scale}</span>}
          </div>
          <div className="text-ink-soft">{item.text ?? 'No wording in the codebook.'}</div>
        </div>
      ))}
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 border-t border-rule pt-2">
        <dt className="text-ink-faint">r</dt>
        <dd className="num text-left" data-testid="hover-r">
          {format(evidence?.r ?? r)} {interval && <span className="text-ink-faint">[{format(interval.lower)}, {format(interval.upper)}]</span>}
        </dd>
        <dt className="text-ink-faint">n</dt>
        <dd className="num text-left">{n ?? '—'}</dd>
        {evidence && (
          <>
            {evidence.residual !== null && (
              <>
                <dt className="text-ink-faint">Residual</dt>
                <dd className="num text-left">
                  {format(evidence.residual)}
                  {evidence.residualCritical !== null && <span className="text-ink-faint"> (flag above {format(evidence.residualCritical)})</span>}
                </dd>
              </>
            )}
            {evidence.mi !== null && (
              <>
                <dt className="text-ink-faint">Modification index</dt>
                <dd className="num text-left" data-testid="hover-mi">
                  {evidence.mi.toFixed(1)}
                  {evidence.miCritical !== null && <span className="text-ink-faint"> (flag above {evidence.miCritical.toFixed(1)})</span>}
                  {evidence.sepc !== null && <span className="text-ink-faint">; standardized change {format(evidence.sepc)}</span>}
                </dd>
              </>
            )}
            {evidence.wto !== null && (
              <>
                <dt className="text-ink-faint">wTO</dt>
                <dd className="num text-left">{format(evidence.wto)}</dd>
              </>
            )}
            {evidence.partial !== null && (
              <>
                <dt className="text-ink-faint">Partial r</dt>
                <dd className="num text-left">{format(evidence.partial)}</dd>
              </>
            )}
            {evidence.wording !== null && (
              <>
                <dt className="text-ink-faint">Wording</dt>
                <dd className="num text-left">{format(evidence.wording)} similar</dd>
              </>
            )}
          </>
        )}
      </dl>
      {evidence ? (
        <p className="text-xs text-ink-soft" data-testid="hover-evidence">
          Flagged by the audit{evidence.rules.length > 0 ? `: ${evidence.rules.join(', ')}` : ' as a strong pair'}.
          {!data.localDependence && ' This audit has no local-dependence figures (residual, modification index, wTO, partial r).'}
        </p>
      ) : (
        <p className="text-xs text-ink-faint">Not among the pairs the audit flagged.{interval && ' Interval from Fisher\u2019s z on the rounded r.'}</p>
      )}
      {cluster !== null && <p className="text-xs font-semibold text-ink">Both in overlap cluster {cluster + 1}.</p>}
    </div>
  );
}
