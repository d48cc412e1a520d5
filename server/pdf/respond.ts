/**
 * Rendering a file for a response: on the worker pool (503 with Retry-After when it is full,
 * nothing at all when the client has gone). server/downloads.ts sends it.
 */
import type { Response } from 'express';
import { HttpError } from '../http.js';
import type { RenderJob } from './model.js';
import { PdfBusyError, renderInPool } from './pool.js';

/** Renders on the pool; null when the client went away meanwhile. */
export async function renderForResponse(res: Response, job: RenderJob): Promise<Uint8Array | null> {
  const gone = new AbortController();
  res.on('close', () => {
    if (!res.writableEnded) gone.abort();
  });
  try {
    return await renderInPool(job, gone.signal);
  } catch (err) {
    if (gone.signal.aborted) return null;
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
}
