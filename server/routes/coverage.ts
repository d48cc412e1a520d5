/**
 * Coverage: the matrix of a framework's outcomes by year level and term (JSON, CSV and a
 * landscape PDF in the school's paper size). Leads, admins and teachers; each sees the units
 * the policy lets them see. Mounted at the API root.
 */
import { Router } from 'express';
import type { AppContext } from '../context.js';
import { parse } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { coverageQuerySchema } from '../../shared/schemas/review.js';
import { coverageMatrix } from '../review/coverage-matrix.js';
import { coverageCsv } from '../review/coverage-csv.js';
import { loadPrintContext } from '../pdf/load.js';
import { renderForResponse } from '../pdf/respond.js';
import { sendDownload, slug } from '../downloads.js';

export function coverageRouter(ctx: AppContext): Router {
  const router = Router();

  async function load(req: Parameters<Parameters<Router['get']>[1]>[0]) {
    const actor = requireActor(req);
    authorize(actor, 'coverage.read');
    const query = parse(coverageQuerySchema, req.query);
    const generatedAt = new Date();
    return ctx.db.transaction(
      async (tx) => ({
        query,
        matrix: await coverageMatrix(tx, actor, query),
        print: await loadPrintContext(tx, actor.schoolId, generatedAt),
      }),
      { isolationLevel: 'repeatable read', accessMode: 'read only' },
    );
  }

  router.get('/coverage', async (req, res) => {
    res.json((await load(req)).matrix);
  });

  router.get('/coverage.csv', async (req, res) => {
    const { matrix } = await load(req);
    sendDownload(
      res,
      'text/csv; charset=utf-8',
      `coverage-${slug(matrix.framework.name)}.csv`,
      coverageCsv(matrix),
    );
  });

  router.get('/coverage.pdf', async (req, res) => {
    const { matrix, print, query } = await load(req);
    const bytes = await renderForResponse(res, {
      kind: 'coverage',
      print,
      coverage: matrix,
      scope: query.status === 'endorsed' ? 'Endorsed units only' : 'All units',
    });
    if (!bytes) return;
    sendDownload(res, 'application/pdf', `coverage-${slug(matrix.framework.name)}.pdf`, bytes);
  });

  return router;
}
