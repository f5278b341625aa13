/** Request schemas of the study routes (types and calls: ../studies.ts). */
import { z } from 'zod';

/** Body of POST /api/studies (`teamId` may be left out when the caller may create in one team only). */
export const createStudyRequest = z.object({
  teamId: z.string().min(1).max(64).optional(),
  name: z.string().trim().min(1, 'A study needs a name.').max(200),
  description: z.string().trim().max(4000).default(''),
});
