import type { APIRoute } from 'astro';
import { errorResponse } from '../../lib/server/errors';

/** Any other /api/ path: a 404 in the API's error shape rather than the HTML page. */
export const ALL: APIRoute = () => errorResponse(404, 'no-such-route', 'There is no such API route; see the API description (api.md).');
