/**
 * Turns a PDF page into pixels with pdfjs's own Node canvas (its optional @napi-rs/canvas
 * dependency), for tests that read QR codes back from rendered labels.
 */
import type { PDFDocumentProxy } from 'pdfjs-dist/legacy/build/pdf.mjs';

/** Points to pixels: 3 × 72 = 216 dpi, plenty for QR modules of about 0.9 mm. */
export const SCALE = 3;

/** The part of a 2D canvas context the tests read. */
export interface Canvas2d {
  getImageData(
    x: number,
    y: number,
    w: number,
    h: number,
  ): { data: Uint8ClampedArray; width: number; height: number };
}

/** Renders page `n` of `doc` at SCALE and answers its drawing context. */
export async function renderPage(doc: PDFDocumentProxy, n: number): Promise<Canvas2d> {
  const page = await doc.getPage(n);
  const viewport = page.getViewport({ scale: SCALE });
  // pdfjs-dist exposes the canvas factory it uses in Node; no canvas package of our own is needed.
  const factory = (
    doc as unknown as {
      canvasFactory: { create(w: number, h: number): { canvas: unknown; context: Canvas2d } };
    }
  ).canvasFactory;
  const { canvas, context } = factory.create(viewport.width, viewport.height);
  await page.render({ canvasContext: context as never, canvas: canvas as never, viewport }).promise;
  return context;
}
