import type { APIRoute } from 'astro';
import { decisionRequestSchema } from '../../../../../lib/api/cut-list';
import { endpoint, readJson } from '../../../../../lib/server/endpoint';
import { fail, json } from '../../../../../lib/server/errors';
import { requireAccess } from '../../../../../lib/server/guard';
import { cutListItem, setDecision } from '../../../../../lib/server/cut-list';

/**
 * PUT /api/studies/{id}/cut-list/{itemId} (owner, designer): keep, drop, merge (with `into`),
 * reword (with `wording`) or undecided, with a reason for all but undecided. 409 `item-locked`
 * for dropping or merging a locked item; 409 when a merge would point at a removed item.
 */
export const PUT: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { study, user } = requireAccess(locals, 'study', params.id ?? '', 'decide:item');
  const body = await readJson(request, decisionRequestSchema);
  const itemId = params.itemId ?? '';
  const { changed } = setDecision(user, study, {
    itemId,
    decision: body.decision,
    into: body.decision === 'merge' ? (body.into ?? null) : null,
    wording: body.decision === 'reword' ? (body.wording ?? null) : null,
    reason: body.reason,
  });
  const item = cutListItem(study, itemId);
  if (!item) throw fail.notFound('No such item in this study.', 'item-not-found');
  return json({ item, changed });
});
