import type { APIRoute } from 'astro';
import type { SetupResponse } from '../../lib/api/setup';
import { setupRequest } from '../../lib/api/schemas/setup';
import { createFirstOwner } from '../../lib/server/accounts';
import { endpoint, readJson } from '../../lib/server/endpoint';
import { json } from '../../lib/server/errors';

/** POST /api/setup: on an empty database only, create the first owner and their team. */
export const POST: APIRoute = endpoint(async ({ request }) => {
  const input = await readJson(request, setupRequest);
  const created: SetupResponse = await createFirstOwner(input);
  return json(created, 201);
});
