/**
 * Build instructions in the packs: an activity's attachments, loaded with the lesson, printed as
 * "Build instructions" pages (images, scaled to the page) and, for PDF attachments, pages of
 * their own after the pack's own pages. pdfmake lays out every page, the attached PDFs' pages as
 * "carrier" pages holding only their caption, header and footer, so its `Page N of M` counts
 * them; ./merge.ts then draws each attached page into its carrier with pdf-lib.
 */
import type { PaperSize } from '../../shared/schemas/school.js';
import type { Content, ContentNode } from './content.js';
import { contentWidth, PAGE_MARGINS, PAGE_SIZES, sectionTitle } from './layout.js';

/** An attachment as a pack carries it to the worker (plain data: it crosses by structured clone). */
export interface PackAttachment {
  lessonId: string;
  activityTitle: string;
  filename: string;
  contentType: string;
  bytes: Uint8Array;
}

/** An attached PDF as measured in the worker: its page count, or null when it cannot be read. */
export interface MeasuredPdf {
  file: PackAttachment;
  pages: number | null;
}

/** Image types pdfmake draws; others (WebP) are named for the reader to open on screen. */
const PRINTABLE_IMAGES = new Set(['image/png', 'image/jpeg']);

/** Room kept above an attached page for its caption line. */
export const CARRIER_CAPTION_HEIGHT = 22;

/** The body's height on the paper (between the top and bottom margins). */
function bodyHeight(paper: PaperSize): number {
  return PAGE_SIZES[paper].height - PAGE_MARGINS[1] - PAGE_MARGINS[3];
}

/**
 * One lesson's "Build instructions" pages: per activity, its images each scaled to fit the page
 * (the first under the section title), and a note naming the files that print elsewhere (PDFs,
 * appended at the end) or not at all (WebP).
 */
export function buildInstructionPages(
  files: readonly PackAttachment[],
  paper: PaperSize,
  appendedPdfs: boolean,
): Content[] {
  const out: Content[] = [];
  const titles = [...new Set(files.map((f) => f.activityTitle))];
  for (const title of titles) {
    const own = files.filter((f) => f.activityTitle === title);
    const images = own.filter((f) => PRINTABLE_IMAGES.has(f.contentType));
    const pdfs = own.filter((f) => f.contentType === 'application/pdf');
    const other = own.filter(
      (f) => !PRINTABLE_IMAGES.has(f.contentType) && f.contentType !== 'application/pdf',
    );
    const notes: string[] = [];
    if (pdfs.length) {
      notes.push(
        appendedPdfs
          ? `Printed at the end of this pack: ${pdfs.map((f) => f.filename).join(', ')}.`
          : `Left out of this pack: ${pdfs.map((f) => f.filename).join(', ')}.`,
      );
    }
    if (other.length) {
      notes.push(
        `Open on screen (cannot be printed here): ${other.map((f) => f.filename).join(', ')}.`,
      );
    }
    out.push(
      sectionTitle('Build instructions', `${title}${notes.length ? ` · ${notes.join(' ')}` : ''}`),
    );
    images.forEach((image, i) => {
      const node: ContentNode = {
        image: `data:${image.contentType};base64,${Buffer.from(image.bytes).toString('base64')}`,
        // Scaled to the page, keeping its proportions; the title and caption take the rest.
        fit: [contentWidth(paper), bodyHeight(paper) - (i === 0 ? 110 : 40)],
        alignment: 'center',
      };
      out.push({
        ...(i === 0 ? {} : { pageBreak: 'before' }),
        stack: [{ text: image.filename, style: 'decoration', margin: [0, 0, 0, 6] }, node],
      });
    });
  }
  return out;
}

/**
 * The carrier pages of the attached PDFs, in order: each holds only its caption; the attached
 * page is drawn below it later. An unreadable PDF gets a page saying so instead.
 */
export function carrierPages(pdfs: readonly MeasuredPdf[], breakFirst = true): Content[] {
  const out: ContentNode[] = [];
  for (const { file, pages } of pdfs) {
    if (pages === null) {
      out.push({
        pageBreak: 'before',
        stack: [
          { text: 'Build instructions', style: 'sectionTitle' },
          {
            text: `${file.activityTitle} · ${file.filename} could not be printed (the file cannot be read). Open it from the lesson page.`,
            style: 'body',
          },
        ],
      });
      continue;
    }
    for (let k = 1; k <= pages; k++) {
      out.push({
        pageBreak: 'before',
        text: `Build instructions · ${file.activityTitle} · ${file.filename} · page ${k} of ${pages}`,
        style: 'decoration',
        margin: [0, 0, 0, 0],
      });
    }
  }
  // A section starts on a page of its own already: a break before its first node would leave a
  // blank page.
  if (!breakFirst && out[0]) delete out[0].pageBreak;
  return out;
}
