/** Request schema of POST /api/tokens (types and calls: ../tokens.ts). */
import { z } from 'zod';

/** Body of POST /api/tokens. */
export const createTokenRequest = z.object({ name: z.string().trim().min(1, 'Name the token after what uses it.').max(100) });
