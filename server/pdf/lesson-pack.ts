/**
 * The lesson pack: cover (two pages: running the lesson, then outcomes and relief notes), prep
 * checklist, one pull sheet per group, class and spares trays, device pairing, pack-away (return
 * map and count-back, then the missing-parts log) and the cautions. Every section starts on a
 * new page, so a pack of n groups has n + 8 pages when each part fits its page (every demo
 * lesson does, on A4 and on Letter). A part that runs over breaks where keep.ts allows.
 */
import type { Content } from './content.js';
import type { LessonPackModel, PrintContext } from './model.js';
import { longDate } from './format.js';
import { warningBox } from './layout.js';
import { cover } from './pack-cover.js';
import { checklist, devices, pullSheets, trays } from './pack-sheets.js';
import { packAway } from './pack-away.js';
import { cautions } from './cautions.js';
import { packView } from './pack-view.js';
import { markdownToContent } from './markdown.js';

/** The pages printed for a lesson the engine cannot plan yet (stored data it refuses). */
function unplannable(lesson: LessonPackModel, print: PrintContext): Content[] {
  return [
    { text: `Lesson pack · ${lesson.unitTitle}`.toUpperCase(), style: 'kicker' },
    { text: lesson.title, style: 'title' },
    {
      text: `Lesson ${lesson.number} of ${lesson.lessonCount} · ${lesson.className} · ${longDate(lesson.startsAt, print.timezone)}`,
      margin: [0, 0, 0, 8],
    },
    warningBox('This lesson cannot be planned yet', [
      'Trayplan cannot make its pull lists until these are fixed in the lesson:',
      ...lesson.problems.map((p) => `• ${p}`),
    ]),
    { text: 'Relief notes', style: 'heading' },
    ...(lesson.reliefNotes.trim()
      ? markdownToContent(lesson.reliefNotes)
      : [{ text: 'No relief notes.', italics: true }]),
    ...cautions(lesson),
  ];
}

/** Every node of one lesson's pack, its sections in order. */
export function lessonPackContent(lesson: LessonPackModel, print: PrintContext): Content[] {
  if (!lesson.plan) return unplannable(lesson, print);
  const view = packView(lesson, lesson.plan, print);
  return [
    ...cover(view),
    ...checklist(view),
    ...pullSheets(view),
    ...trays(view),
    ...devices(view),
    ...packAway(view),
    ...cautions(lesson),
  ];
}
