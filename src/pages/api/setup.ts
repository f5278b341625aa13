import type { APIRoute } from 'astro';
import { z } from 'zod';
import { createFirstOwner } from '../../lib/server/accounts';
import { endpoint, readJson } from '../../lib/server/endpoint';
import { json } from '../../lib/server/errors';
import { passwordSchema } from '../../lib/server/passwords';

const body = z.object({
  teamName: z.string().trim().min(1, 'The team needs a name.').max(200),
  name: z.string().trim().min(1, 'Your name is needed.').max(200),
  email: z.email('That is not an e-mail address.').max(320),
  password: passwordSchema,
});

/** POST /api/setup: on an empty database only, create the first owner and their team. */
export const POST: APIRoute = endpoint(async ({ request }) => {
  const input = await readJson(request, body);
  const created = await createFirstOwner(input);
  return json(created, 201);
});
