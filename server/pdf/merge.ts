/**
 * The attached PDFs' pages drawn into their carrier pages (see ./attachments.ts) with pdf-lib
 * 1.17. Each attached page is embedded whole (as a form XObject) and scaled to the body of its
 * carrier, keeping proportions, so A4 and Letter attachments both fit either paper. pdf-lib adds
 * no fonts here: every word on the page comes from pdfmake (embedded fonts) or the attachment.
 */
import { PDFDocument } from 'pdf-lib';
import type { PaperSize } from '../../shared/schemas/school.js';
import { CARRIER_CAPTION_HEIGHT, type MeasuredPdf, type PackAttachment } from './attachments.js';
import { PAGE_MARGINS, PAGE_SIZES } from './layout.js';

/** Each attached PDF's page count, or null when pdf-lib cannot read it. */
export async function measurePdfs(files: readonly PackAttachment[]): Promise<MeasuredPdf[]> {
  const out: MeasuredPdf[] = [];
  for (const file of files) {
    try {
      const doc = await PDFDocument.load(file.bytes, {
        ignoreEncryption: true,
        updateMetadata: false,
      });
      out.push({ file, pages: doc.getPageCount() });
    } catch {
      out.push({ file, pages: null });
    }
  }
  return out;
}

/**
 * Draws the attached pages into the last carrier pages of `pack` (they are the document's last
 * pages, in the order of `pdfs`). Returns the merged file.
 */
export async function drawAttachedPages(
  pack: Uint8Array,
  pdfs: readonly MeasuredPdf[],
  paper: PaperSize,
): Promise<Uint8Array> {
  const total = pdfs.reduce((n, p) => n + (p.pages ?? 1), 0);
  if (!pdfs.some((p) => p.pages)) return pack;
  const out = await PDFDocument.load(pack, { updateMetadata: false });
  const pages = out.getPages();
  let index = pages.length - total;
  const { width, height } = PAGE_SIZES[paper];
  const [left, top, right, bottom] = PAGE_MARGINS;
  const boxWidth = width - left - right;
  const boxHeight = height - top - bottom - CARRIER_CAPTION_HEIGHT;
  for (const { file, pages: count } of pdfs) {
    if (count === null) {
      index += 1;
      continue;
    }
    const source = await PDFDocument.load(file.bytes, {
      ignoreEncryption: true,
      updateMetadata: false,
    });
    const embedded = await out.embedPdf(
      source,
      Array.from({ length: count }, (_, i) => i),
    );
    for (const page of embedded) {
      const scale = Math.min(boxWidth / page.width, boxHeight / page.height, 1);
      const w = page.width * scale;
      const h = page.height * scale;
      pages[index]!.drawPage(page, {
        x: left + (boxWidth - w) / 2,
        // From the bottom margin up, the page's top just under the caption.
        y: bottom + (boxHeight - h),
        width: w,
        height: h,
      });
      index += 1;
    }
  }
  return out.save({ useObjectStreams: false });
}
