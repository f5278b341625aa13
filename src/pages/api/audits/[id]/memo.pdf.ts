import { memoRoute } from '../../../../lib/server/memo/memo-route';

/** GET /api/audits/{id}/memo.pdf: the redundancy memo as a PDF. */
export const GET = memoRoute('pdf');
