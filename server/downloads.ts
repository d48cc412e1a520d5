/**
 * Downloads: their file names (`4K-2026-07-28-rescue-rovers-lesson-2.pdf` and the like) and the
 * one Content-Disposition header every download sends (`sendDownload`).
 */
import type { Response } from 'express';

/** ASCII letters, digits and single hyphens, case kept: `4K`, `Room-3`. */
function asciiWords(text: string): string {
  return text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
}

/** A lower-case slug: `Rescue Rovers (4M)` → `rescue-rovers-4m`; `fallback` when nothing is left. */
export function slug(text: string, fallback = 'untitled'): string {
  return asciiWords(text).toLowerCase() || fallback;
}

/** `4K-2026-07-28-rescue-rovers-lesson-2`: class, date, unit, lesson number. */
export function lessonFileStem(lesson: {
  className: string;
  startsAt: string;
  unitTitle: string;
  number: number;
}): string {
  const parts = [
    asciiWords(lesson.className),
    lesson.startsAt.slice(0, 10),
    slug(lesson.unitTitle),
  ];
  return `${parts.filter(Boolean).join('-')}-lesson-${lesson.number}`;
}

/** `4K-rescue-rovers`: the class when every lesson has the same one, and the unit. */
export function unitFileStem(unitTitle: string, classNames: readonly string[]): string {
  const classes = [...new Set(classNames)];
  const prefix = classes.length === 1 ? asciiWords(classes[0]!) : '';
  return [prefix, slug(unitTitle)].filter(Boolean).join('-');
}

/** RFC 8187 attr-char: what may stay unencoded in `filename*`. */
const ATTR_CHAR = /[A-Za-z0-9!#$&+\-.^_`|~]/;

/**
 * `Content-Disposition: attachment` with the file name (RFC 6266 §4), always quoted: an ASCII
 * `filename` for old clients and, when the name is not plain ASCII, `filename*` in UTF-8
 * (RFC 8187 §3.2). Not Express's `res.attachment()`: it leaves a name without spaces unquoted,
 * and Trayplan's downloads have always sent it quoted, so the header is written here, only here.
 */
export function attachment(filename: string): string {
  const ascii = filename.replace(/["\\]/g, '').replace(/[^\x20-\x7e]/g, '_');
  if (/^[\x20-\x7e]*$/.test(filename)) return `attachment; filename="${ascii}"`;
  let encoded = '';
  for (const byte of Buffer.from(filename, 'utf8')) {
    const ch = String.fromCharCode(byte);
    encoded +=
      byte < 0x80 && ATTR_CHAR.test(ch)
        ? ch
        : `%${byte.toString(16).toUpperCase().padStart(2, '0')}`;
  }
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

/** Sends `body` as a download named `filename` with the given content type. */
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
