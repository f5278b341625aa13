import type { APIRoute } from 'astro';
import { endpoint } from '../../../../lib/server/endpoint';
import { requireAccess } from '../../../../lib/server/guard';
import { exportCsv, exportFileName } from '../../../../lib/server/handoff/exports';
import { parseVersionNumber, versionDetail } from '../../../../lib/server/handoff/versions';

/**
 * GET /api/studies/{id}/cut-list.csv (members): the latest published version (or `?version=N`)
 * as CSV for programming; 409 before any version.
 */
export const GET: APIRoute = endpoint(({ locals, params, url }) => {
  const { study } = requireAccess(locals, 'study', params.id ?? '', 'export:cutlist');
  const asked = url.searchParams.get('version');
  const version = versionDetail(study.id, asked === null ? null : parseVersionNumber(asked));
  return new Response(exportCsv(version), {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${exportFileName(study.name, version.number, 'csv')}"`,
      'Cache-Control': 'no-store',
    },
  });
});
