import type { APIRoute } from 'astro';
import type { OutboxResponse } from '../../lib/api/outbox';
import { endpoint } from '../../lib/server/endpoint';
import { fail, json } from '../../lib/server/errors';
import { requireUser } from '../../lib/server/guard';
import { listOutbox, outboxEnabled } from '../../lib/server/outbox';

/** GET /api/outbox: kept e-mails (MAIL_TRANSPORT=outbox only): one's own, and an owner's team mail. */
export const GET: APIRoute = endpoint(({ locals }) => {
  const user = requireUser(locals);
  if (!outboxEnabled()) throw fail.notFound('The outbox is off: e-mail is sent by SMTP.', 'outbox-off');
  return json({ mails: listOutbox(user) } satisfies OutboxResponse);
});
