/**
 * Answering with a rendered file: render on the worker pool (503 with Retry-After when it is
 * full, nothing at all when the client has gone), then send it as a download.
 */
import type { Response } from 'express';
import { HttpError } from '../http.js';
import type { RenderJob } from './model.js';
import { PdfBusyError, renderInPool } from './pool.js';
import { attachment } from './names.js';

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

/** Sends bytes or text as a download with an ASCII file name. */
export function sendDownload(
  res: Response,
  type: string,
  filename: string,
  body: Uint8Array | string,
): void {
  res.setHeader('Content-Type', type);
  res.setHeader('Content-Disposition', attachment(filename));
  res.send(
    typeof body === 'string' ? body : Buffer.from(body.buffer, body.byteOffset, body.byteLength),
  );
}
