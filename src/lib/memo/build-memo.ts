/**
 * Writes the redundancy memo (a format-neutral `MemoDocument`) from a stored audit and the
 * decisions. Pure: the DOCX, PDF and HTML renderers draw what this returns, and the server only
 * gathers the input. Aggregates only: no respondent row reaches the memo.
 */
import type { AuditJson, AuditRecommendationJson } from '../audit/audit-json';
import type { MemoBlock, MemoColumn, MemoDocument } from './memo-document';
import { coefficient, count, dateTime, fileStem, fixed, inflation, NO_VALUE, percent } from './memo-format';
import type { MemoDecision, MemoInput } from './memo-input';
import { MEMO_METHODS } from './memo-methods';
import { actionWords, constraintWords, documentCautions, driverModelRowsNote, methodRationale, methodWords, overlapSentences, SMALL_PAIR_N } from '../words';
import { orderForOverlapMap } from './overlap-order';

const left = (label: string, weight = 1): MemoColumn => ({ label, align: 'left', weight });
const right = (label: string, weight = 1): MemoColumn => ({ label, align: 'right', weight });

const numberOrNull = (value: unknown): number | null => (typeof value === 'number' ? value : null);

function itemText(audit: AuditJson, id: string): string {
  const item = audit.items.find((candidate) => candidate.id === id) as { text?: string | null } | undefined;
  return item?.text?.trim() || NO_VALUE;
}

function smallestPairN(audit: AuditJson): number | null {
  const n = audit.correlation?.n;
  if (!n || n.length === 0) return null;
  let smallest = Infinity;
  for (let i = 0; i < n.length; i += 1) for (let j = i + 1; j < n.length; j += 1) smallest = Math.min(smallest, n[i][j]);
  return Number.isFinite(smallest) ? smallest : null;
}

function coverSection(input: MemoInput): MemoBlock[] {
  const { decisions, review } = input;
  const version = decisions.version === null
    ? 'Current decisions (not yet published)'
    : `Published version ${decisions.version}${decisions.publishedAt ? `, ${dateTime(decisions.publishedAt)}` : ''}${decisions.publishedBy ? ` by ${decisions.publishedBy}` : ''}`;
  const reviewWords = review
    ? `${review.verdict === 'approved' ? 'Approved' : 'Changes asked for'} by ${review.reviewer ?? 'a former member'}, ${dateTime(review.at)}`
    : 'Not reviewed yet';
  return [
    {
      kind: 'facts',
      rows: [
        ['Study', input.study.name],
        ['Team', input.study.team],
        ['Wave', `${input.wave.label}${input.wave.fileName ? ` (${input.wave.fileName})` : ''}`],
        ['Audit', `${input.audit.id}, finished ${dateTime(input.audit.finishedAt)}`],
        ['Decisions reported', version],
        ['Prepared by', input.preparedBy ?? NO_VALUE],
        ['Review', reviewWords],
        ['Generated', dateTime(input.generatedAt)],
      ],
    },
    ...(input.study.description.trim() ? [{ kind: 'paragraph', text: input.study.description.trim() } as const] : []),
  ];
}

function dataSection(input: MemoInput): MemoBlock[] {
  const audit = input.audit.result;
  const blocks: MemoBlock[] = [{ kind: 'heading', level: 1, text: '1. Data and screening' }];
  const itemsInMatrix = typeof audit.input.itemsInMatrix === 'number' ? audit.input.itemsInMatrix : audit.correlation.items.length;
  blocks.push({
    kind: 'facts',
    rows: [
      ['Respondents read', count(audit.input.rows)],
      ['Respondents used', count(audit.input.respondentsUsed)],
      ['Respondents set aside', count(audit.input.respondentsExcluded)],
      ['Items', `${count(audit.input.items)} (${count(itemsInMatrix)} in the correlation matrix)`],
    ],
  });
  if (input.screening && input.screening.flags.length > 0) {
    blocks.push({
      kind: 'table',
      columns: [left('Screening flag', 3), right('Respondents')],
      rows: input.screening.flags.map((flag) => [flag.message, count(flag.count)]),
      caption: `Screening of ${count(input.screening.respondents)} respondents; the designer chose whom to set aside. A respondent may carry several flags.`,
    });
  } else {
    blocks.push({ kind: 'paragraph', text: 'The wave was not screened for careless responding before this audit.', tone: 'note' });
  }
  const missing = audit.settings.missing === 'pairwise'
    ? 'Missing answers were handled pairwise: each correlation uses every respondent who answered both items, so pairs rest on different numbers of respondents. This assumes that answers are missing at random.'
    : 'Missing answers were handled listwise: only respondents who answered every item enter the correlation matrix.';
  const repaired = audit.correlation.repaired
    ? ' The correlation matrix was not positive definite and was repaired before the statistics that invert it (see the warnings below).'
    : '';
  blocks.push({ kind: 'paragraph', text: missing + repaired });
  if (audit.warnings.length > 0) {
    blocks.push({
      kind: 'bullets',
      items: audit.warnings.map((warning) =>
        warning.items.length > 0 && warning.items.length <= 4 && !warning.items.some((id) => warning.message.includes(id)) ? `${warning.items.join(', ')}: ${warning.message}` : warning.message,
      ),
    });
  }
  return blocks;
}

function settingsSection(input: MemoInput): MemoBlock[] {
  const settings = input.audit.result.settings as unknown as Record<string, unknown>;
  const rows = Object.entries(settings)
    .filter(([, value]) => value === null || ['string', 'number', 'boolean'].includes(typeof value))
    .map(([key, value]) => [key, value === null ? 'none' : String(value)]);
  return [
    { kind: 'heading', level: 1, text: '2. Settings' },
    { kind: 'paragraph', text: methodRationale[input.audit.result.settings.method] ?? '' },
    {
      kind: 'table',
      columns: [left('Setting', 2), left('Value', 2)],
      rows,
      caption: `With these settings, seed ${String(settings.seed ?? NO_VALUE)} and ${String(settings.bootstrap ?? 0)} bootstrap resamples, the audit reproduces exactly.`,
    },
  ];
}

function descriptivesSection(audit: AuditJson): MemoBlock[] {
  return [
    { kind: 'heading', level: 1, text: '3. Item descriptives' },
    {
      kind: 'table',
      columns: [left('Item', 1.3), left('Scale', 1.3), right('n'), right('Mean'), right('SD'), right('Missing'), right('Floor'), right('Ceiling'), right('Item-rest')],
      rows: audit.items.map((item) => [
        `${item.id}${item.reverse ? ' (R)' : ''}`,
        item.scale ?? NO_VALUE,
        count(item.n),
        fixed(item.mean),
        fixed(item.sd),
        percent(item.missingRate),
        percent(item.floor),
        percent(item.ceiling),
        coefficient(item.itemRest),
      ]),
      caption: '(R) marks reverse-keyed items, recoded before every statistic. Floor and ceiling: share of answers at the lowest and highest category (above 15% is worth a look, Terwee et al. 2007). Item-rest: the item against the sum of the other items of its scale.',
    },
  ];
}

function meanInterItem(audit: AuditJson, items: readonly string[]): number | null {
  const index = new Map(audit.correlation.items.map((id, position) => [id, position]));
  const positions = items.map((id) => index.get(id)).filter((position): position is number => position !== undefined);
  let sum = 0;
  let pairs = 0;
  for (let a = 0; a < positions.length; a += 1) {
    for (let b = a + 1; b < positions.length; b += 1) {
      const r = audit.correlation.matrix[positions[a]][positions[b]];
      if (Number.isFinite(r)) {
        sum += r;
        pairs += 1;
      }
    }
  }
  return pairs > 0 ? sum / pairs : null;
}

function structureSection(audit: AuditJson): MemoBlock[] {
  const map = orderForOverlapMap(audit);
  const blocks: MemoBlock[] = [
    { kind: 'heading', level: 1, text: '4. Correlation structure' },
    {
      kind: 'figure',
      figure: map,
      caption: `The overlap map: ${methodWords[audit.settings.method] ?? audit.settings.method} correlations of the recoded items, ordered ${map.orderedBy}. Deep rust is a strong positive correlation, indigo a strong negative one, the paper colour none (the same scale as the overlap map on screen).`,
    },
    {
      kind: 'table',
      columns: [left('Scale', 2), right('Items'), right('Mean inter-item r'), right('Alpha'), right('Standardized alpha'), right('Omega total')],
      rows: audit.scales.map((scale) => [
        scale.id,
        count(scale.items.length),
        coefficient(meanInterItem(audit, scale.items)),
        coefficient(scale.alpha),
        coefficient(scale.alphaStd),
        coefficient(scale.omegaTotal),
      ]),
      caption: 'Alpha is computed from the raw covariances; omega total from one-factor loadings on the chosen correlation matrix. Alpha above about .95 often signals redundant items rather than a better scale (Streiner 2003).',
    },
  ];
  blocks.push({ kind: 'heading', level: 1, text: '5. Dimensionality' });
  blocks.push({
    kind: 'figure',
    figure: { kind: 'eigenvalues', observed: audit.eigenvalues, random95: audit.parallelAnalysis?.random95 ?? null },
    caption: 'Eigenvalues of the correlation matrix (dots) against the 95th percentile of eigenvalues of random data of the same size (line). Components above the line are more than noise (parallel analysis, Horn 1965).',
  });
  const bartlett = audit.bartlett;
  blocks.push({
    kind: 'facts',
    rows: [
      ['Components suggested by parallel analysis', audit.parallelAnalysis ? count(audit.parallelAnalysis.suggested) : NO_VALUE],
      ['Eigenvalues above 1 (Kaiser, shown, not trusted alone)', count(audit.eigenvalues.filter((value) => value > 1).length)],
      ['Kaiser-Meyer-Olkin measure', `${fixed(audit.kmo)}${(audit as { kmoLabel?: string | null }).kmoLabel ? ` (${(audit as { kmoLabel?: string | null }).kmoLabel})` : ''}`],
      ["Bartlett's test of sphericity", bartlett && bartlett.chi2 !== null ? `χ² = ${fixed(bartlett.chi2, 1)}, df = ${count(bartlett.df)}, p ${bartlett.p !== null && bartlett.p < 0.001 ? '< .001' : `= ${coefficient(bartlett.p, 3)}`}` : NO_VALUE],
      ['Condition number of the correlation matrix', inflation(audit.conditionNumber, true)],
    ],
  });
  return blocks;
}

function clusterBlocks(audit: AuditJson, recommendation: AuditRecommendationJson, index: number): MemoBlock[] {
  const evidence = recommendation.evidence as AuditRecommendationJson['evidence'] & {
    pairs?: { items: [string, string]; r: number; n: number; lower: number | null; upper: number | null; wording: number | null; residual?: number | null; wto?: number | null }[];
    dependencies?: { dimension: number; conditionIndex: number | null; items: string[]; proportions: number[] }[];
  };
  const blocks: MemoBlock[] = [
    { kind: 'heading', level: 2, text: `6.${index + 1} ${recommendation.cluster.join(', ')}` },
    { kind: 'paragraph', text: recommendation.reason },
  ];
  const pairs = evidence.pairs ?? [];
  if (pairs.length > 0) {
    const hasResidual = pairs.some((pair) => typeof pair.residual === 'number');
    const hasWto = pairs.some((pair) => typeof pair.wto === 'number');
    blocks.push({
      kind: 'table',
      columns: [left('Pair', 2), right('r'), right('95% interval', 1.3), right('n'), ...(hasResidual ? [right('Residual r')] : []), ...(hasWto ? [right('wTO')] : []), right('Wording similarity', 1.2)],
      rows: pairs.map((pair) => [
        pair.items.join(' – '),
        coefficient(pair.r),
        pair.lower === null || pair.upper === null ? NO_VALUE : `${coefficient(pair.lower)} to ${coefficient(pair.upper)}`,
        count(pair.n),
        ...(hasResidual ? [coefficient(pair.residual ?? null)] : []),
        ...(hasWto ? [coefficient(pair.wto ?? null)] : []),
        coefficient(pair.wording),
      ]),
    });
  }
  const dependencies = evidence.dependencies ?? [];
  if (dependencies.length > 0) {
    blocks.push({
      kind: 'table',
      columns: [right('Dimension'), right('Condition index'), left('Variance proportions', 3)],
      rows: dependencies.map((dependency) => [
        count(dependency.dimension),
        inflation(dependency.conditionIndex, true),
        dependency.items.map((item, position) => `${item} ${coefficient(dependency.proportions[position])}`).join(', '),
      ]),
      caption: 'Belsley-Kuh-Welsch condition indices of the scaled, uncentred data matrix (30 and above: a strong near-dependency) with the share of each item’s coefficient variance tied to that dimension.',
    });
  }
  blocks.push({
    kind: 'table',
    columns: [left('Item'), left('Wording', 4)],
    rows: recommendation.cluster.map((id) => [id, itemText(audit, id)]),
  });
  const stability = recommendation.stability;
  const unstable = (recommendation as { unstable?: boolean }).unstable === true;
  blocks.push({
    kind: 'facts',
    rows: [
      ['Largest VIF in the cluster, before the cut', inflation(evidence.vifBefore, true)],
      ['VIF of the kept item after the cut', inflation(evidence.vifAfter, false)],
      ['Stability across bootstrap resamples', stability === null ? 'not checked' : `${percent(stability, 0)}${unstable ? ' (unstable: the recommendation flips across resamples)' : ''}`],
    ],
  });
  return blocks;
}

function evidenceSection(audit: AuditJson): MemoBlock[] {
  const blocks: MemoBlock[] = [{ kind: 'heading', level: 1, text: '6. Redundancy evidence' }];
  if (audit.recommendations.length === 0) {
    blocks.push({ kind: 'paragraph', text: 'The audit found no overlap cluster: no pair of items says the same thing twice by the evidence it weighs.' });
    return blocks;
  }
  blocks.push({ kind: 'paragraph', text: `The audit found ${count(audit.recommendations.length)} overlap cluster${audit.recommendations.length === 1 ? '' : 's'}: groups of items tied by a strong pair correlation, by local dependence, or by one near-dependency.` });
  audit.recommendations.forEach((recommendation, index) => blocks.push(...clusterBlocks(audit, recommendation, index)));
  return blocks;
}

function decisionsSection(input: MemoInput): MemoBlock[] {
  const audit = input.audit.result;
  const blocks: MemoBlock[] = [{ kind: 'heading', level: 1, text: '7. Decisions' }];
  const order = new Map(audit.items.map((item, position) => [item.id, position]));
  const decided = [...input.decisions.items].sort((a, b) => (order.get(a.itemId) ?? Infinity) - (order.get(b.itemId) ?? Infinity));
  const changed = decided.filter((decision) => decision.decision !== 'keep' && decision.decision !== 'undecided');
  const tally = (kind: MemoDecision['decision']) => count(decided.filter((decision) => decision.decision === kind).length);
  blocks.push({
    kind: 'paragraph',
    text: `${tally('keep')} items kept, ${tally('drop')} dropped, ${tally('merge')} merged, ${tally('reword')} to be reworded, ${tally('undecided')} undecided.`,
  });
  const undecided = decided.filter((decision) => decision.decision === 'undecided').map((decision) => decision.itemId);
  if (undecided.length > 0) {
    blocks.push({
      kind: 'paragraph',
      tone: 'note',
      text: input.decisions.version === null
        ? `Not decided yet: ${undecided.join(', ')}. The cut list can be published once every item has a decision.`
        : `Not decided in this version: ${undecided.join(', ')}.`,
    });
  }
  if (changed.length > 0) {
    blocks.push({
      kind: 'table',
      columns: [left('Item'), left('Decision', 1.2), left('Why', 3), left('Decided', 1.6)],
      rows: changed.map((decision) => [
        decision.itemId,
        decision.decision === 'merge' && decision.into ? `Merge into ${decision.into}` : actionWords[decision.decision] ?? decision.decision,
        [decision.reason || NO_VALUE, decision.wording ? `New wording: “${decision.wording}”` : ''].filter(Boolean).join(' '),
        `${decision.decidedBy ?? NO_VALUE}, ${dateTime(decision.decidedAt)}`,
      ]),
    });
  }
  const blocked = audit.recommendations.flatMap((recommendation) =>
    recommendation.actions
      .filter((action) => Array.isArray(action.blockedBy) && (action.blockedBy as unknown[]).length > 0)
      .map((action) => [action.item, (action.blockedBy as string[]).map((code) => constraintWords[code] ?? code).join('; ')]),
  );
  const locked = audit.items.filter((item) => (item as { locked?: boolean }).locked === true).map((item) => item.id);
  if (blocked.length > 0 || locked.length > 0) {
    blocks.push({ kind: 'heading', level: 2, text: 'Kept by a constraint or a lock' });
    if (locked.length > 0) blocks.push({ kind: 'paragraph', text: `Locked items (trend, mandated or licensed questions), never proposed for cutting: ${locked.join(', ')}.` });
    if (blocked.length > 0) {
      blocks.push({
        kind: 'table',
        columns: [left('Item'), left('Constraint that kept it', 3)],
        rows: blocked,
        caption: 'The audit would have cut these items, but a constraint set for the study stopped it (minimum items per scale, reliability floor, largest alpha drop or share of items cut).',
      });
    }
  }
  return blocks;
}

function effectSection(audit: AuditJson): MemoBlock[] {
  const after = audit.afterCut as (AuditJson['afterCut'] & {
    maxVifBefore?: number | null;
    conditionNumberBefore?: number | null;
    scales: { id: string; alpha: number | null; omegaTotal: number | null; items: number; alphaBefore?: number | null; omegaBefore?: number | null; itemsBefore?: number; spearmanBrown?: number | null }[];
  }) | null;
  const blocks: MemoBlock[] = [{ kind: 'heading', level: 1, text: '8. Before and after the proposed cut' }];
  if (!after) {
    blocks.push({ kind: 'paragraph', text: 'No cut was proposed, so nothing changes.' });
    return blocks;
  }
  const maxVifBefore = audit.items.some((item) => (item as { inMatrix?: boolean }).inMatrix !== false && item.vif === null)
    ? null
    : Math.max(...audit.items.map((item) => item.vif ?? 0));
  blocks.push({
    kind: 'table',
    columns: [left('Scale', 2), right('Items before'), right('Items after'), right('Alpha before'), right('Alpha after'), right('Omega before'), right('Omega after'), right('Spearman-Brown')],
    rows: after.scales.map((scale) => [
      scale.id,
      typeof scale.itemsBefore === 'number' ? count(scale.itemsBefore) : NO_VALUE,
      count(scale.items),
      coefficient(numberOrNull(scale.alphaBefore)),
      coefficient(scale.alpha),
      coefficient(numberOrNull(scale.omegaBefore)),
      coefficient(scale.omegaTotal),
      coefficient(numberOrNull(scale.spearmanBrown)),
    ]),
    caption: 'Spearman-Brown: the reliability the shortened scale would have if its items were as good as the average item before the cut (Spearman 1910; Brown 1910).',
  });
  blocks.push({
    kind: 'facts',
    rows: [
      ['Largest VIF', `${inflation(maxVifBefore, true)} before, ${inflation(after.maxVif, false)} after`],
      ['Condition number of the correlation matrix', `${inflation(audit.conditionNumber, true)} before, ${inflation(after.conditionNumber, false)} after`],
      ['Items removed', count(after.itemsRemoved)],
      ['Answering time saved per respondent', `${fixed(after.minutesSaved, 1)} minutes`],
    ],
  });
  const model = audit.outcomeModel;
  if (model) {
    blocks.push({ kind: 'heading', level: 2, text: `Driver model of ${model.outcome}` });
    blocks.push({
      kind: 'table',
      columns: [left('Term', 1.4), right('Estimate'), right('SE'), right('t'), right('p'), right('VIF'), right('Relative weight', 1.2)],
      rows: model.coefficients.map((coefficientRow) => [
        coefficientRow.term,
        fixed(coefficientRow.estimate, 3),
        fixed(coefficientRow.se, 3),
        fixed(coefficientRow.t, 2),
        coefficientRow.p === null ? NO_VALUE : coefficientRow.p < 0.001 ? '< .001' : coefficient(coefficientRow.p, 3),
        inflation(coefficientRow.vif, false),
        coefficient(coefficientRow.relativeWeight),
      ]),
      caption: `Ordinary least squares on ${count(model.n)} complete rows: R² = ${coefficient(model.r2)}, adjusted R² = ${coefficient(model.adjR2)}. An item's standard error grows with the square root of its VIF.`,
    });
    blocks.push(...driverModelAfterCut(audit));
  }
  return blocks;
}

type SplitCoefficient = { term: string; se: number | null; vif: number | null; seFactors?: { residualScale: number; spread: number; overlap: number } | null; seRatio?: number | null };

/** The driver model after the cut: what the cut does to each remaining standard error. */
function driverModelAfterCut(audit: AuditJson): MemoBlock[] {
  const model = audit.outcomeModel;
  if (!model) return [];
  const before = (model.coefficients as SplitCoefficient[]).filter((row) => row.term !== '(intercept)');
  const after = new Map(((model.afterCut?.coefficients ?? []) as SplitCoefficient[]).map((row) => [row.term, row]));
  const split = (row: SplitCoefficient | undefined) =>
    row && row.se !== null && row.seFactors ? { own: row.seFactors.residualScale / row.seFactors.spread, overlap: Math.max(0, row.se - row.seFactors.residualScale / row.seFactors.spread) } : null;
  const blocks: MemoBlock[] = [
    { kind: 'paragraph', text: driverModelRowsNote(typeof model.completeRows === 'number' ? model.completeRows : model.n, audit.input.respondentsUsed, audit.settings.missing) },
  ];
  const sentences = overlapSentences(before.map((row) => ({ term: row.term, vif: row.vif, ratioAfterCut: model.afterCut ? after.get(row.term)?.seRatio ?? null : null })));
  if (sentences.length > 0) blocks.push({ kind: 'bullets', items: sentences });
  blocks.push({
    kind: 'figure',
    figure: { kind: 'standard-errors', hasCut: Boolean(model.afterCut), rows: before.map((row) => ({ term: row.term, before: split(row), after: model.afterCut ? split(after.get(row.term)) : null })) },
    caption: "Each item's standard error: the part it would have without overlap (residual scale over the item's own spread) and the part overlap adds; the paler bar is the same model after the proposed cut, on the same respondents.",
  });
  if (model.afterCut) {
    blocks.push({
      kind: 'table',
      columns: [left('Item', 1.4), right('SE before'), right('SE after'), right('After / before'), right('VIF before')],
      rows: before.map((row) => {
        const later = after.get(row.term);
        return [row.term, fixed(row.se, 3), later ? fixed(later.se, 3) : 'cut', later ? fixed(later.seRatio ?? null) : NO_VALUE, inflation(row.vif, false)];
      }),
      caption: `After the cut: R² = ${coefficient(model.afterCut.r2)}, adjusted R² = ${coefficient(model.afterCut.adjR2)} (before: ${coefficient(model.r2)}, ${coefficient(model.adjR2)}).`,
    });
  }
  return blocks;
}

function closingSections(input: MemoInput): MemoBlock[] {
  const audit = input.audit.result;
  const smallest = smallestPairN(audit);
  const limitations = [
    smallest === null
      ? 'The correlations rest on few respondents; read every figure with its interval.'
      : `The smallest pair correlation rests on ${count(smallest)} respondents${smallest < SMALL_PAIR_N ? ', a small pilot sample: read each correlation with its interval and each recommendation with its stability share' : ''}.`,
    audit.settings.missing === 'pairwise'
      ? 'Pairwise handling of missing answers assumes they are missing at random; items skipped for a reason (routing, sensitive topics) can bias their correlations.'
      : 'Listwise handling keeps only complete respondents, who may differ from those who skipped items.',
    'Bootstrap stability shows how much a recommendation depends on this particular sample, not whether it holds in the population to be fielded.',
  ];
  const blocks: MemoBlock[] = [
    { kind: 'heading', level: 1, text: '9. Cautions and limitations' },
    { kind: 'caution', items: documentCautions },
    { kind: 'bullets', items: limitations },
    { kind: 'heading', level: 1, text: '10. Review' },
  ];
  if (input.review) {
    blocks.push({
      kind: 'facts',
      rows: [
        ['Reviewer', input.review.reviewer ?? NO_VALUE],
        ['Decision', input.review.verdict === 'approved' ? 'Approved' : 'Changes asked for'],
        ['Date', dateTime(input.review.at)],
        ['Comment', input.review.comment || NO_VALUE],
      ],
    });
  } else {
    blocks.push({ kind: 'facts', rows: [['Reviewer', NO_VALUE], ['Decision', 'Not reviewed yet'], ['Date', NO_VALUE], ['Signature', '']] });
  }
  if (input.comments.length > 0) {
    blocks.push({
      kind: 'table',
      columns: [left('Who and when', 1.5), left('About'), left('Comment', 3)],
      rows: input.comments.map((comment) => [`${comment.author ?? 'a former member'}, ${dateTime(comment.at)}`, comment.about, comment.body]),
    });
  }
  blocks.push({ kind: 'heading', level: 1, text: 'Appendix: methods and sources' });
  blocks.push({
    kind: 'table',
    columns: [left('Statistic', 1.4), left('What it is for', 2), left('Source', 2.4)],
    rows: MEMO_METHODS.map((method) => [method.statistic, method.use, method.source]),
  });
  return blocks;
}

/**
 * Writes the memo.
 * @param input the audit, decisions, study, wave and review (aggregates only).
 * @throws Error when the audit result is not a paredown.audit/1 document.
 * @returns the memo as a format-neutral document.
 */
export function buildMemo(input: MemoInput): MemoDocument {
  const audit = input.audit.result;
  if (!audit || audit.schema !== 'paredown.audit/1') {
    throw new Error('buildMemo: the audit result is not a paredown.audit/1 document');
  }
  const blocks: MemoBlock[] = [
    ...coverSection(input),
    ...dataSection(input),
    ...settingsSection(input),
    ...descriptivesSection(audit),
    ...structureSection(audit),
    ...evidenceSection(audit),
    ...decisionsSection(input),
    ...effectSection(audit),
    ...closingSections(input),
  ];
  return {
    title: `Redundancy memo: ${input.study.name}`,
    subtitle: `${input.wave.label} · ${methodWords[audit.settings.method] ?? audit.settings.method} correlations · ${count(audit.input.respondentsUsed)} respondents, ${count(audit.input.items)} items`,
    fileStem: fileStem('paredown-memo', input.study.name, input.wave.label, input.decisions.version === null ? 'current' : `v${input.decisions.version}`),
    generatedAt: input.generatedAt,
    blocks,
  };
}
