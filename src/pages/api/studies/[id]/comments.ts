import type { APIRoute } from 'astro';
import { commentRequestSchema } from '../../../../lib/api/handoff';
import { endpoint, readJson } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';
import { addComment, listComments } from '../../../../lib/server/handoff/conversation';

/** GET /api/studies/{id}/comments (members): the team's threads on the study, its items and audits. */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'read:study');
  return json(listComments(study.id));
});

/** POST /api/studies/{id}/comments (members): a comment on the study, an item or an audit, or an answer (`parentId`). */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, study } = requireAccess(locals, 'study', params.id ?? '', 'comment');
  const body = await readJson(request, commentRequestSchema);
  return json({ comment: addComment(user, study, body) }, 201);
});
