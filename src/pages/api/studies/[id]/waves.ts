import type { APIRoute } from 'astro';
import type { UploadWaveResponse } from '../../../../lib/api/waves';
import { getConfig } from '../../../../lib/server/config';
import { json } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';
import { readUploadForm } from '../../../../lib/server/waves/read-upload-form';
import { uploadWave } from '../../../../lib/server/waves/upload-wave';
import { waveEndpoint } from '../../../../lib/server/waves/wave-endpoint';
import { waveReaders } from '../../../../lib/server/waves/wave-readers';

/**
 * POST /api/studies/{id}/waves (owner, designer): upload responses as multipart/form-data
 * (`file`, optional `codebook`, `sheet`, `label`, `asNewWave`). Answers 201 with the proposed wave,
 * its column setup, warnings and screening preview; 200 with `duplicate: true` and the wave
 * already holding the same upload; the reader's refusals as 400, 413 or 422; 503 `readers-busy`
 * (with Retry-After) when every wave reader is busy and the line is full, checked before the body
 * is read (src/lib/server/waves/wave-readers.ts).
 */
export const POST: APIRoute = waveEndpoint(async ({ locals, params, request }) => {
  const { user, study } = requireAccess(locals, 'study', params.id ?? '', 'upload:wave');
  waveReaders().checkRoom();
  const form = await readUploadForm(request, getConfig().limits.uploadBytes);
  const { duplicate, view } = await uploadWave(user, study, form);
  return json({ ...view, duplicate } satisfies UploadWaveResponse, duplicate ? 200 : 201, { Location: `/api/waves/${view.wave.id}` });
});
