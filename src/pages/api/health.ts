import type { APIRoute } from 'astro';
import type { HealthResponse } from '../../lib/api/setup';
import { sql } from 'drizzle-orm';
import { uploadFolderProblem } from '../../lib/server/storage-fault';
import { getConfig } from '../../lib/server/config';
import { getDb } from '../../lib/server/db';
import { endpoint } from '../../lib/server/endpoint';
import { json } from '../../lib/server/errors';

/**
 * GET /api/health: no sign-in; answers whether the server, its database and its upload storage
 * respond: 200 `{ status: 'ok' }`, or 503 `{ status: 'degraded', storage: 'not-writable', ... }`.
 */
export const GET: APIRoute = endpoint(() => {
  getDb().get(sql`select 1`);
  const problem = uploadFolderProblem(getConfig().uploadDir);
  if (problem) {
    return json({
      status: 'degraded',
      storage: 'not-writable',
      message: `The upload storage cannot be written (${problem}); uploads are refused until it can.`,
    } satisfies HealthResponse, 503);
  }
  return json({ status: 'ok' } satisfies HealthResponse);
});
