/**
 * Set-up of the tray tests: the demo lesson moved to a day whose tray codes are still live, and
 * its labels' QR codes read back from the rendered pages (pdfjs-dist to pixels, jsQR to text).
 */
import { and, eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import jsQRModule from 'jsqr';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { renderPage, SCALE } from './pdf-pixels.js';
import type { Db } from '../../server/db/client.js';
import { lessons, units } from '../../server/db/schema/index.js';
import { labelGrid } from '../../server/pdf/labels.js';
import type { Browser } from './app.js';
import { download } from './planning.js';

// jsqr is CommonJS: under NodeNext its default import is module.exports, whose `default` is jsQR.
const jsQR = jsQRModule.default;

/** The demo school's timezone (the seed's). */
export const SCHOOL_ZONE = 'Australia/Adelaide';

/** The demo "Rescue Rovers" lesson at `position`. */
export async function demoLessonId(db: Db, position = 1): Promise<string> {
  const [unit] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  const [lesson] = await db
    .select()
    .from(lessons)
    .where(and(eq(lessons.unitId, unit!.id), eq(lessons.position, position)));
  return lesson!.id;
}

/**
 * Moves a lesson `days` from today in the school's timezone, keeping its times of day (a live
 * tray code needs a lesson today or later; STACK-NOTES, "Tokens tied to a lesson's day").
 */
export async function moveLesson(db: Db, lessonId: string, days: number): Promise<string> {
  const [row] = await db.select().from(lessons).where(eq(lessons.id, lessonId));
  const day = DateTime.now().setZone(SCHOOL_ZONE).plus({ days }).toISODate()!;
  const startsAt = `${day} ${row!.startsAt.slice(11)}`;
  const endsAt = `${day} ${row!.endsAt.slice(11)}`;
  await db.update(lessons).set({ startsAt, endsAt }).where(eq(lessons.id, lessonId));
  return day;
}

/** One label as printed: the QR code's text and the words inside the label. */
export interface PrintedLabel {
  qr: string | null;
  text: string;
}

/** Downloads the lesson's labels (A4) and reads every label back from the rendered pixels. */
export async function readLabels(b: Browser, lessonId: string): Promise<PrintedLabel[]> {
  const res = await download(b, `/api/lessons/${lessonId}/labels.pdf`);
  if (res.status !== 200) throw new Error(`labels.pdf answered ${res.status}`);
  return readLabelsPdf(new Uint8Array(res.body as Buffer));
}

/** Reads every label of an A4 labels PDF back from its rendered pixels (and its text). */
export async function readLabelsPdf(data: Uint8Array): Promise<PrintedLabel[]> {
  const doc = await getDocument({ data }).promise;
  const grid = labelGrid('A4');
  const pageHeight = 841.89;
  const out: PrintedLabel[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n);
    const items = (await page.getTextContent()).items
      .filter((i): i is Extract<typeof i, { str: string }> => 'str' in i && i.str.trim() !== '')
      .map((i) => ({ str: i.str, x: i.transform[4] as number, y: i.transform[5] as number }));
    const context = await renderPage(doc, n);
    for (const slot of grid.slots) {
      const inside = items
        .filter((it) => it.x >= slot.x && it.x < slot.x + grid.width)
        .filter((it) => pageHeight - it.y >= slot.y && pageHeight - it.y < slot.y + grid.height)
        .map((it) => it.str)
        .join(' ');
      if (!inside) continue;
      const [x, y, w, h] = [slot.x, slot.y, grid.width, grid.height].map((v) =>
        Math.round(v * SCALE),
      );
      const image = context.getImageData(x!, y!, w!, h!);
      out.push({ qr: jsQR(image.data, image.width, image.height)?.data ?? null, text: inside });
    }
  }
  await doc.destroy();
  return out;
}
