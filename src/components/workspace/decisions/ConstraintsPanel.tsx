import type { CutListConstraints } from '../../../lib/api/cut-list';
import { formatNumber, lockedCaution } from '../../../lib/words';

/** The locks and constraints decisions are made under (the study's, with the audit's locks). */
export default function ConstraintsPanel({ constraints }: { constraints: CutListConstraints }) {
  return (
    <section className="panel p-4" aria-labelledby="constraints-heading" data-testid="constraints">
      <h2 id="constraints-heading" className="mb-2 font-semibold">Locks and constraints</h2>
      <dl className="space-y-1.5 text-sm">
        <div>
          <dt className="text-ink-soft">Locked items</dt>
          <dd>{constraints.lockedItems.length === 0 ? <span className="text-ink-faint">none</span> : constraints.lockedItems.map((id) => <code key={id} className="mr-1.5">{id}</code>)}</dd>
        </div>
        <div className="flex justify-between gap-3"><dt className="text-ink-soft">Items per scale, at least</dt><dd className="num">{constraints.minItemsPerScale ?? '—'}</dd></div>
        <div className="flex justify-between gap-3"><dt className="text-ink-soft">Scale alpha, at least</dt><dd className="num">{formatNumber(constraints.alphaFloor, 2)}</dd></div>
      </dl>
      {constraints.lockedItems.length > 0 && <p className="mt-2 text-xs text-ink-faint">{lockedCaution}</p>}
    </section>
  );
}
