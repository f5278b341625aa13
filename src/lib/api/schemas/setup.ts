/** Request schema of POST /api/setup (types and calls: ../setup.ts). */
import { z } from 'zod';
import { passwordSchema } from './me';

/** Body of POST /api/setup: the first owner and their team (on an empty database only). */
export const setupRequest = z.object({
  teamName: z.string().trim().min(1, 'The team needs a name.').max(200),
  name: z.string().trim().min(1, 'Your name is needed.').max(200),
  email: z.email('That is not an e-mail address.').max(320),
  password: passwordSchema,
});
