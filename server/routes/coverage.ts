/**
 * Coverage: the matrix of a framework's outcomes by year level and term (JSON, CSV and a
 * landscape PDF in the school's paper size). Leads, admins and teachers; each sees the units
 * the policy lets them see. Mounted at the API root.
 */
import { Router } from 'express';
import type { AppContext } from '../context.js';
import { HttpError, parse } from '../http.js';
import { authorize } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { coverageQuerySchema } from '../../shared/schemas/review.js';
import { coverageMatrix } from '../review/coverage-matrix.js';
import { coverageCsv } from '../review/coverage-csv.js';
import { loadPrintContext } from '../pdf/load.js';
import { PdfBusyError, renderInPool } from '../pdf/pool.js';
import { attachment, slug } from '../pdf/names.js';

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
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', attachment(`coverage-${slug(matrix.framework.name)}.csv`));
    res.send(coverageCsv(matrix));
  });

  router.get('/coverage.pdf', async (req, res) => {
    const { matrix, print, query } = await load(req);
    const gone = new AbortController();
    res.on('close', () => {
      if (!res.writableEnded) gone.abort();
    });
    let bytes: Uint8Array;
    try {
      bytes = await renderInPool(
        {
          kind: 'coverage',
          print,
          coverage: matrix,
          scope: query.status === 'endorsed' ? 'Endorsed units only' : 'All units',
        },
        gone.signal,
      );
    } catch (err) {
      if (gone.signal.aborted) return;
      if (err instanceof PdfBusyError || (err as Error).name === 'AbortError') {
        throw new HttpError(
          503,
          'printing-busy',
          'Trayplan is busy making other files. Try again in a moment.',
          undefined,
          { headers: { 'Retry-After': '5' } },
        );
      }
      throw err;
    }
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', attachment(`coverage-${slug(matrix.framework.name)}.pdf`));
    res.send(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  });

  return router;
}
