import type { APIRoute } from 'astro';
import type { DriverCoefficientView, DriverModelResponse } from '../../../../lib/api/driver-model';
import { auditJobs } from '../../../../lib/server/audit-jobs/audit-jobs';
import { endpoint } from '../../../../lib/server/endpoint';
import { fail } from '../../../../lib/server/errors';
import { requireAccess } from '../../../../lib/server/guard';

/**
 * GET /api/audits/{id}/driver-model (members: aggregates only): the audit's outcome model before
 * and after the proposed cut, the rows it rests on, or a sentence saying why there is none.
 * 409 `audit-not-done` until the audit is done.
 */
export const GET: APIRoute = endpoint(({ locals, params }) => {
  const id = params.id ?? '';
  requireAccess(locals, 'audit', id, 'read:audit');
  const jobs = auditJobs();
  const summary = jobs.summary(id);
  if (!summary) throw fail.notFound('No such audit among your teams.', 'audit-not-found');
  const audit = jobs.result(id);
  if (audit === null) throw fail.conflict(`The audit is ${summary.status}; its driver model can be read once it is done.`, 'audit-not-done');
  const model = audit.outcomeModel;
  let answer: DriverModelResponse;
  if (!model) {
    answer = { model: null, note: 'This audit has no outcome: choose one in the audit settings to see how overlap inflates a driver model.' };
  } else {
    answer = {
      model: {
        outcome: model.outcome,
        n: model.n,
        r2: model.r2,
        adjR2: model.adjR2,
        sigma: model.sigma,
        completeRows: model.completeRows ?? model.n,
        respondentsUsed: audit.input.respondentsUsed,
        missing: audit.settings.missing,
        coefficients: model.coefficients as DriverCoefficientView[],
        afterCut: model.afterCut
          ? { removed: model.afterCut.removed, n: model.afterCut.n, r2: model.afterCut.r2, adjR2: model.afterCut.adjR2, sigma: model.afterCut.sigma, coefficients: model.afterCut.coefficients }
          : null,
      },
      note: null,
    };
  }
  return new Response(JSON.stringify(answer), { headers: { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' } });
});
