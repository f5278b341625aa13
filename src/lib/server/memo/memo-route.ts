/**
 * The handler behind GET /api/audits/{id}/memo.docx and /memo.pdf (every member: the memo holds
 * aggregates only). `?version=N` reports a published version, `?decisions=current` the current
 * decisions; by default the latest published version, or the current decisions before any.
 */
import type { APIRoute } from 'astro';
import { endpoint } from '../endpoint';
import { requireAccess } from '../guard';
import { memoDecisionChoice } from './memo-input';
import { memoFile, type MemoFormat } from './memo-files';

/**
 * The route for one memo format.
 * @param format docx or pdf.
 * @returns the Astro GET handler.
 */
export function memoRoute(format: MemoFormat): APIRoute {
  return endpoint(async ({ locals, params, url }) => {
    const id = params.id ?? '';
    const { user } = requireAccess(locals, 'audit', id, 'export:memo');
    const file = await memoFile(id, format, memoDecisionChoice(url.searchParams), user.name);
    return new Response(new Uint8Array(file.bytes), {
      headers: {
        'Content-Type': file.mediaType,
        'Content-Disposition': `attachment; filename="${file.fileName}"`,
        'Cache-Control': 'no-store',
      },
    });
  });
}
