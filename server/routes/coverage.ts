/**
 * Coverage: the matrix of a framework's outcomes by year level and term (JSON, CSV and a
 * landscape PDF in the school's paper size). Leads, admins and teachers; each sees the units
 * the policy lets them see. One resource in three formats, so it is one handler on one path
 * pattern (`COVERAGE_PATH`) rather than a router: a mount path cannot hold the file extension.
 */
import type { Request, RequestHandler, Response } from 'express';
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

/** `/coverage`, `/coverage.csv` and `/coverage.pdf`; the format is the first capture. */
export const COVERAGE_PATH = /^\/coverage(?:\.(csv|pdf))?$/;

export function coverageHandler(ctx: AppContext): RequestHandler {
  async function load(req: Request) {
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

  async function json(req: Request, res: Response) {
    res.json((await load(req)).matrix);
  }

  async function csv(req: Request, res: Response) {
    const { matrix } = await load(req);
    sendDownload(
      res,
      'text/csv; charset=utf-8',
      `coverage-${slug(matrix.framework.name)}.csv`,
      coverageCsv(matrix),
    );
  }

  async function pdf(req: Request, res: Response) {
    const { matrix, print, query } = await load(req);
    const bytes = await renderForResponse(res, {
      kind: 'coverage',
      print,
      coverage: matrix,
      scope: query.status === 'endorsed' ? 'Endorsed units only' : 'All units',
    });
    if (!bytes) return;
    sendDownload(res, 'application/pdf', `coverage-${slug(matrix.framework.name)}.pdf`, bytes);
  }

  return async (req, res) => {
    const format = (req.params as Record<string, string | undefined>)[0];
    await (format === 'csv' ? csv : format === 'pdf' ? pdf : json)(req, res);
  };
}
