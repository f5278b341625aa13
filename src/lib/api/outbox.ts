/** Contracts of GET /api/outbox (MAIL_TRANSPORT=outbox only). */
import { callApi, type ApiResult } from './client';

/** One kept e-mail. */
export interface OutboxMail {
  id: number;
  to: string;
  subject: string;
  text: string;
  createdAt: string;
}

/** GET /api/outbox: one's own mail, and an owner's team mail. */
export interface OutboxResponse {
  mails: OutboxMail[];
}

/** The typed calls of this domain. */
export const outboxApi = {
  list: (): Promise<ApiResult<OutboxResponse>> => callApi('GET', '/api/outbox'),
};
