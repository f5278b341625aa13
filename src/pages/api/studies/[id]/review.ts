import type { APIRoute } from 'astro';
import { reviewRequestSchema } from '../../../../lib/api/handoff';
import { endpoint, readJson } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';
import { addReview, reviewState } from '../../../../lib/server/handoff/conversation';

/** GET /api/studies/{id}/review (members): the review state of the latest published version and every review. */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'read:study');
  return json(reviewState(study.id));
});

/**
 * POST /api/studies/{id}/review (client reviewer, owner): approve the latest published version,
 * or ask for changes with a comment; the designers are e-mailed either way; 409 before any version.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const { user, study } = requireAccess(locals, 'study', params.id ?? '', 'review');
  const body = await readJson(request, reviewRequestSchema);
  return json(await addReview(user, study, body), 201);
});
