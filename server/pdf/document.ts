/**
 * A render job → its pdfmake document definition → PDF bytes. Pure but for pdfmake itself: no
 * clock (the job carries `generatedAt`), no database, no network, no file read after the fonts.
 * The worker thread calls `renderPdf`; tests may call it directly.
 */
import type { Content, DocumentDefinition } from './content.js';
import type { LessonPackModel, PrintContext, RenderJob } from './model.js';
import {
  buildInstructionPages,
  carrierPages,
  type MeasuredPdf,
  type PackAttachment,
} from './attachments.js';
import { drawAttachedPages, measurePdfs } from './merge.js';
import { preparePdfmake } from './fonts.js';
import { generatedLabel } from './format.js';
import { documentFrame, pageFooter, pageHeader } from './layout.js';
import { lessonPackContent } from './lesson-pack.js';
import { lessonHeading } from './pack-view.js';
import { unitPackContent } from './unit-pack.js';
import { labelsDocument } from './labels.js';
import { coverageDocument } from './coverage.js';

/** The document definition of a job; `pdfs` are its attached PDFs as measured (see renderPdf). */
export function buildDocument(
  job: RenderJob,
  pdfs: readonly MeasuredPdf[] = [],
): DocumentDefinition {
  const { print } = job;
  const footer = pageFooter(print.paper, generatedLabel(print.generatedAt, print.timezone));
  switch (job.kind) {
    case 'lesson-pack': {
      const subject = lessonHeading(job.lesson);
      return documentFrame(
        print.paper,
        { title: `Lesson pack: ${job.lesson.title}`, subject, generatedAt: print.generatedAt },
        [
          ...lessonPackContent(job.lesson, print),
          ...withInstructions(job.lesson, job.attachments ?? [], print.paper),
          ...carrierPages(pdfs),
        ],
        { header: pageHeader(print.paper, subject), footer },
      );
    }
    case 'unit-pack':
      return documentFrame(
        print.paper,
        {
          title: `Unit pack: ${job.unit.title}`,
          subject: job.unit.title,
          generatedAt: print.generatedAt,
        },
        [
          ...unitPackContent(job.unit, job.lessons, print, (lesson) =>
            withInstructions(lesson, job.attachments ?? [], print.paper),
          ),
          ...(pdfs.length
            ? [
                {
                  section: carrierPages(pdfs, false),
                  header: pageHeader(print.paper, job.unit.title),
                },
              ]
            : []),
        ],
        { footer },
      );
    case 'labels':
      return labelsDocument(job.lesson, job.groupUrls, job.groupCodes, print);
    case 'coverage':
      return coverageDocument(job);
  }
}

/** A lesson's build instruction pages (its images; its PDFs are named and appended). */
function withInstructions(
  lesson: LessonPackModel,
  files: readonly PackAttachment[],
  paper: PrintContext['paper'],
): Content[] {
  const own = files.filter((f) => f.lessonId === lesson.id);
  return own.length ? buildInstructionPages(own, paper, true) : [];
}

/**
 * Renders a job to PDF bytes: attached PDFs are measured first so pdfmake lays out (and
 * numbers) a carrier page for each of their pages, then pdf-lib draws them in.
 */
export async function renderPdf(job: RenderJob): Promise<Uint8Array> {
  const pdfmake = preparePdfmake();
  const files = job.kind === 'labels' || job.kind === 'coverage' ? [] : (job.attachments ?? []);
  const pdfs = await measurePdfs(files.filter((f) => f.contentType === 'application/pdf'));
  const buffer = await pdfmake.createPdf(buildDocument(job, pdfs)).getBuffer();
  const bytes = new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  return pdfs.length ? drawAttachedPages(bytes, pdfs, job.print.paper) : bytes;
}
