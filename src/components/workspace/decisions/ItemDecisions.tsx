import { Fragment, useState, type FormEvent } from 'react';
import { decisionKinds, decisionLabels, type CutListItem, type CutListResponse, type DecisionKind } from '../../../lib/api/cut-list';
import { formatNumber, lockedCaution } from '../../../lib/words';
import { formatDayAndTime } from '../../date-words';
import { decisionPhrase, mergeTargets, stabilityPhrase } from './decision-words';
import { ScrollRegion } from '../../ScrollRegion';

type Change = { decision: DecisionKind; into: string | null; wording: string | null; reason: string };

interface Props {
  cutList: CutListResponse;
  busy: boolean;
  onDecide: (item: CutListItem, change: Change) => Promise<string | null>;
}

const filters = ['all', 'recommended', 'undecided', 'decided'] as const;
type Filter = (typeof filters)[number];
const filterWords: Record<Filter, string> = { all: 'All items', recommended: 'In a recommendation', undecided: 'Undecided', decided: 'Decided' };

/** The decision of one item being edited: the control, the merge target, the new wording, the reason. */
function DecisionEditor({ item, items, onCancel, onSave }: { item: CutListItem; items: CutListItem[]; onCancel: () => void; onSave: (change: Change) => Promise<string | null> }) {
  const [decision, setDecision] = useState<DecisionKind>(item.decision === 'undecided' && item.recommendation ? item.recommendation.action : item.decision);
  const targets = mergeTargets(items, item.id);
  const [into, setInto] = useState<string>(item.into ?? item.recommendation?.into ?? targets[0]?.id ?? '');
  const [wording, setWording] = useState(item.wording ?? item.text ?? '');
  const [reason, setReason] = useState(item.decision === decision ? item.reason : '');
  const [error, setError] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const removing = decision === 'drop' || decision === 'merge';
  const id = `decide-${item.id}`;

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    if (decision !== 'undecided' && reason.trim() === '') {
      setError('Say why: a reason is required for every decision except undecided.');
      return;
    }
    if (item.locked && removing) {
      setError(lockedCaution);
      return;
    }
    setSaving(true);
    const problem = await onSave({ decision, into: decision === 'merge' ? into : null, wording: decision === 'reword' ? wording : null, reason: reason.trim() });
    setSaving(false);
    setError(problem);
  };

  return (
    <form onSubmit={submit} className="space-y-2 rounded border border-spruce-100 bg-spruce-50 px-3 py-2.5" data-testid="decision-editor" aria-label={`Decide ${item.id}`}>
      <fieldset>
        <legend className="label">Decision for {item.id}</legend>
        <div className="flex flex-wrap gap-1.5">
          {decisionKinds.map((kind) => {
            const blocked = item.locked && (kind === 'drop' || kind === 'merge');
            return (
              <label key={kind} className={`flex items-center gap-1 rounded border px-2 py-1 text-sm ${decision === kind ? 'border-spruce-700 bg-card font-semibold' : 'border-rule-strong bg-card'} ${blocked ? 'opacity-50' : 'cursor-pointer'}`} title={blocked ? lockedCaution : undefined}>
                <input type="radio" name={`${id}-kind`} value={kind} checked={decision === kind} disabled={blocked} onChange={() => setDecision(kind)} />
                {kind === 'merge' ? 'Merge' : decisionLabels[kind]}
              </label>
            );
          })}
        </div>
      </fieldset>
      {decision === 'merge' && (
        <div>
          <label className="label" htmlFor={`${id}-into`}>Merge into</label>
          <select id={`${id}-into`} className="field" value={into} onChange={(event) => setInto(event.target.value)} data-testid="decision-into">
            {targets.map((target) => (
              <option key={target.id} value={target.id}>{target.id}{target.text ? ` — ${target.text.slice(0, 70)}` : ''}</option>
            ))}
          </select>
        </div>
      )}
      {decision === 'reword' && (
        <div>
          <label className="label" htmlFor={`${id}-wording`}>New wording</label>
          <textarea id={`${id}-wording`} className="field" rows={2} value={wording} onChange={(event) => setWording(event.target.value)} data-testid="decision-wording" />
        </div>
      )}
      <div>
        <label className="label" htmlFor={`${id}-reason`}>Reason {decision === 'undecided' ? '(optional)' : ''}</label>
        <input id={`${id}-reason`} className="field" value={reason} maxLength={2000} onChange={(event) => setReason(event.target.value)} placeholder="Why, in a sentence the team will read" data-testid="decision-reason" />
      </div>
      {error && <p className="error-text" role="alert">{error}</p>}
      <div className="flex gap-2">
        <button type="submit" className="button py-1 text-sm" disabled={saving} data-testid="decision-save">{saving ? 'Saving…' : 'Save decision'}</button>
        <button type="button" className="button button-quiet py-1 text-sm" onClick={onCancel}>Cancel</button>
      </div>
    </form>
  );
}

/**
 * Every item with its decision: wording and scale, the recommendation and its stability, who
 * decided what and why; "Decide" opens the control in place.
 */
export default function ItemDecisions({ cutList, busy, onDecide }: Props) {
  const [editing, setEditing] = useState<string | null>(null);
  const [filter, setFilter] = useState<Filter>('all');
  const items = cutList.items.filter((item) => {
    if (filter === 'recommended') return item.recommendation !== null;
    if (filter === 'undecided') return item.decision === 'undecided';
    if (filter === 'decided') return item.decision !== 'undecided';
    return true;
  });
  return (
    <section className="panel p-4" aria-labelledby="items-heading" data-testid="item-decisions">
      <div className="mb-3 flex flex-wrap items-baseline gap-x-3 gap-y-2">
        <h2 id="items-heading" className="font-semibold">Items</h2>
        <span className="text-xs text-ink-faint">in questionnaire order</span>
        <label className="ml-auto flex items-center gap-2 text-sm text-ink-soft">
          Show
          <select className="field w-auto py-1" value={filter} onChange={(event) => setFilter(event.target.value as Filter)} data-testid="item-filter">
            {filters.map((f) => <option key={f} value={f}>{filterWords[f]}</option>)}
          </select>
        </label>
      </div>
      {cutList.items.length === 0 ? (
        <div className="empty-state">No confirmed wave yet: items appear here once a wave's column setup is confirmed.</div>
      ) : (
        <ScrollRegion label="Decisions item by item">
          <table className="dense-table">
            <thead>
              <tr>
                <th scope="col">Item</th>
                <th scope="col">Recommended</th>
                <th scope="col">Decision</th>
                <th scope="col"><span className="sr-only">Change</span></th>
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <Fragment key={item.id}>
                  <tr data-testid="item-row" data-item={item.id}>
                    <td className="min-w-0">
                      <div className="flex flex-wrap items-baseline gap-x-2">
                        <code className="font-semibold">{item.id}</code>
                        {item.scale && <span className="text-xs text-ink-faint">{item.scale}</span>}
                        {item.locked && <span className="chip" title={lockedCaution} data-testid="locked-chip">locked</span>}
                        {!item.inAudit && <span className="text-xs text-ink-faint">not in the latest audit</span>}
                      </div>
                      {item.text && <div className="text-sm text-ink-soft">{item.text}</div>}
                      {item.vif !== null && item.vif > 5 && <div className="text-xs text-ink-faint">VIF {formatNumber(item.vif, 1)}{item.topPartner && <>, closest to {item.topPartner.id} (r {formatNumber(item.topPartner.r, 2)})</>}</div>}
                    </td>
                    <td className="text-sm">
                      {item.recommendation ? (
                        <>
                          <div className="font-semibold">{decisionPhrase(item.recommendation.action, item.recommendation.into)}</div>
                          <div className={`text-xs ${item.recommendation.unstable ? 'font-semibold text-ochre-700' : 'text-ink-faint'}`}>{stabilityPhrase(item.recommendation.stability, item.recommendation.unstable)}</div>
                        </>
                      ) : (
                        <span className="text-ink-faint">—</span>
                      )}
                    </td>
                    <td className="text-sm" data-testid="item-decision">
                      <div className={item.decision === 'undecided' ? 'text-ink-faint' : 'font-semibold'}>{decisionPhrase(item.decision, item.into)}</div>
                      {item.wording && <div className="text-xs">“{item.wording}”</div>}
                      {/* An item set back to undecided shows no reason or author here; the history keeps them. */}
                      {item.decision !== 'undecided' && item.reason && <div className="text-xs text-ink-soft">{item.reason}</div>}
                      {item.decision !== 'undecided' && item.decidedBy && item.decidedAt && <div className="text-xs text-ink-faint">{item.decidedBy.name}, {formatDayAndTime(item.decidedAt)}</div>}
                    </td>
                    <td className="text-right">
                      {cutList.canDecide && item.inAudit && (
                        <button type="button" className="button button-quiet whitespace-nowrap py-1 text-sm" disabled={busy} aria-expanded={editing === item.id} onClick={() => setEditing(editing === item.id ? null : item.id)} data-testid="decide-button">
                          {item.decision === 'undecided' ? 'Decide' : 'Change'}
                        </button>
                      )}
                    </td>
                  </tr>
                  {editing === item.id && (
                    <tr>
                      <td colSpan={4}>
                        <DecisionEditor
                          item={item}
                          items={cutList.items}
                          onCancel={() => setEditing(null)}
                          onSave={async (change) => {
                            const problem = await onDecide(item, change);
                            if (problem === null) setEditing(null);
                            return problem;
                          }}
                        />
                      </td>
                    </tr>
                  )}
                </Fragment>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
    </section>
  );
}
