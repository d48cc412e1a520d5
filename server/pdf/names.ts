/** File names of downloads: `4K-2026-07-28-rescue-rovers-lesson-2.pdf` and the like. */

/** ASCII letters, digits and single hyphens, case kept: `4K`, `Room-3`. */
function asciiWords(text: string): string {
  return text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
}

/** A lower-case slug: `Rescue Rovers (4M)` → `rescue-rovers-4m`. */
export function slug(text: string): string {
  return asciiWords(text).toLowerCase() || 'untitled';
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

/** The header value for a download (names here are ASCII, so no `filename*` is needed). */
export function attachment(filename: string): string {
  return `attachment; filename="${filename.replace(/["\\]/g, '')}"`;
}
