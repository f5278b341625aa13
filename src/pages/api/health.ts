import type { APIRoute } from 'astro';
import type { HealthResponse } from '../../lib/api/setup';
import { sql } from 'drizzle-orm';
import { getDb } from '../../lib/server/db';
import { endpoint } from '../../lib/server/endpoint';
import { json } from '../../lib/server/errors';

/** GET /api/health: no sign-in; answers whether the server and its database respond. */
export const GET: APIRoute = endpoint(() => {
  getDb().get(sql`select 1`);
  return json({ status: 'ok' } satisfies HealthResponse);
});
