/** Request schemas of the wave routes (types and calls: ../waves.ts). */
import { z } from 'zod';

/** Screening thresholds a confirmation may change (the ingest's defaults where absent). */
export const screeningOptionsRequest = z
  .object({
    longStringShare: z.number().gt(0).lte(1),
    longStringMinimum: z.number().int().gte(2),
    withinSdMaximum: z.number().gte(0),
    withinSdMinimumAnswers: z.number().int().gte(2),
    speederShare: z.number().gt(0).lte(1),
    missingShareAbove: z.number().gte(0).lte(1),
  })
  .partial();

/**
 * Body of PUT /api/waves/{id}/setup: `{ setup: { columns }, exclusions, screening?, dryRun? }`.
 * `setup` is checked against the stored file by the server (its shape depends on the file).
 */
export const confirmSetupRequest = z.object({
  setup: z.unknown().optional(),
  exclusions: z.array(z.number()).optional(),
  screening: screeningOptionsRequest.optional(),
  dryRun: z.boolean().optional(),
});

const yesNo = z.enum(['1', '0', 'true', 'false']).transform((value) => value === '1' || value === 'true');

/** Query of GET /api/waves/{id}/respondents. */
export const respondentsQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  perPage: z.coerce.number().int().min(1).max(1000).default(100),
  flagged: yesNo.default(false),
  excluded: yesNo.default(false),
});
