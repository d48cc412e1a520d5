/**
 * A render job → its pdfmake document definition → PDF bytes. Pure but for pdfmake itself: no
 * clock (the job carries `generatedAt`), no database, no network, no file read after the fonts.
 * The worker thread calls `renderPdf`; tests may call it directly.
 */
import type { DocumentDefinition } from './content.js';
import type { RenderJob } from './model.js';
import { preparePdfmake } from './fonts.js';
import { generatedLabel } from './format.js';
import { documentFrame, pageFooter, pageHeader } from './layout.js';
import { lessonPackContent } from './lesson-pack.js';
import { lessonHeading } from './pack-view.js';
import { unitPackContent } from './unit-pack.js';
import { labelsDocument } from './labels.js';

/** The document definition of a job. */
export function buildDocument(job: RenderJob): DocumentDefinition {
  const { print } = job;
  const footer = pageFooter(print.paper, generatedLabel(print.generatedAt, print.timezone));
  switch (job.kind) {
    case 'lesson-pack': {
      const subject = lessonHeading(job.lesson);
      return documentFrame(
        print.paper,
        { title: `Lesson pack: ${job.lesson.title}`, subject, generatedAt: print.generatedAt },
        lessonPackContent(job.lesson, print),
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
        unitPackContent(job.unit, job.lessons, print),
        { footer },
      );
    case 'labels':
      return labelsDocument(job.lesson, job.groupUrls, print);
  }
}

/** Renders a job to PDF bytes. */
export async function renderPdf(job: RenderJob): Promise<Uint8Array> {
  const pdfmake = preparePdfmake();
  const buffer = await pdfmake.createPdf(buildDocument(job)).getBuffer();
  return new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
}
