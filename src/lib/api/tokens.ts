/** Contracts of the personal API token routes: /api/tokens and /api/tokens/{id}. */
import type { z } from 'zod';
import type { createTokenRequest } from './schemas/tokens';
import { callApi, segment, type ApiResult } from './client';

/** A token as listed (never its secret). */
export interface ApiTokenView {
  id: string;
  name: string;
  /** The first characters of the secret, to recognise it by. */
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
}

/** GET /api/tokens: the caller's live tokens. */
export interface ListTokensResponse {
  tokens: ApiTokenView[];
}

export type CreateTokenRequest = z.input<typeof createTokenRequest>;

/** POST /api/tokens: 201; the secret is in this answer only. */
export interface CreateTokenResponse {
  token: ApiTokenView;
  secret: string;
}

/** The typed calls of this domain. */
export const tokensApi = {
  list: (): Promise<ApiResult<ListTokensResponse>> => callApi('GET', '/api/tokens'),
  create: (body: CreateTokenRequest): Promise<ApiResult<CreateTokenResponse>> => callApi('POST', '/api/tokens', body),
  revoke: (tokenId: string): Promise<ApiResult<null>> => callApi('DELETE', `/api/tokens/${segment(tokenId)}`),
};
