import type { APIRoute } from 'astro';
import { z } from 'zod';
import { endpoint, readJson } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/errors';
import { acceptInvitation } from '../../../../lib/server/invitations';
import { passwordSchema } from '../../../../lib/server/passwords';

const body = z.object({ name: z.string().trim().min(1).max(200).optional(), password: passwordSchema.optional() });

/**
 * POST /api/invitations/{token}/accept: join the team. Signed in as the invited address: no body.
 * Not signed in and no account yet: `{ name, password }` creates the account.
 */
export const POST: APIRoute = endpoint(async ({ locals, params, request }) => {
  const input = await readJson(request, body);
  const result = await acceptInvitation(params.token ?? '', locals.user, input);
  return json(result, 201);
});
