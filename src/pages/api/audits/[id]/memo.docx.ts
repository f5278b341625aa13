import { memoRoute } from '../../../../lib/server/memo/memo-route';

/** GET /api/audits/{id}/memo.docx: the redundancy memo as an editable Word document. */
export const GET = memoRoute('docx');
