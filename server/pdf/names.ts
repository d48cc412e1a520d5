/**
 * File names of downloads: `4K-2026-07-28-rescue-rovers-lesson-2.pdf` and the like. The header
 * itself is Express's `res.attachment(name)` (RFC 6266, with `filename*` when needed).
 */

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
