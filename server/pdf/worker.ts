/**
 * The PDF worker thread (run by the piscina pool in ./pool.ts): receives a plain JSON render
 * job, returns the PDF bytes, transferred rather than copied.
 */
import { move } from 'piscina';
import { renderPdf } from './document.js';
import type { RenderJob } from './model.js';

/** Renders one job; the bytes' buffer is moved to the main thread. */
export default async function render(job: RenderJob): Promise<Uint8Array> {
  const bytes = await renderPdf(job);
  // Transfer needs a buffer of its own (pdfkit's output may be a view into a larger one).
  const own =
    bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? bytes : bytes.slice();
  return move(own) as Uint8Array;
}
