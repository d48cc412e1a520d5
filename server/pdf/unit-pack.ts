/**
 * The unit pack: a unit overview (outcomes, the lessons with their dates), then every lesson's
 * full pack. Each part is a pdfmake section, so each carries its own page header (the unit, then
 * each lesson's title) while the footer numbers the pages of the whole file.
 */
import type { Content, ContentNode } from './content.js';
import type { LessonPackModel, PrintContext, UnitOverviewModel } from './model.js';
import { dataTable, facts, pageHeader, contentWidth, td, th } from './layout.js';
import { localClockTime, plural, shortDate } from './format.js';
import { markdownToContent } from './markdown.js';
import { lessonPackContent } from './lesson-pack.js';
import { lessonHeading } from './pack-view.js';

function lessonNote(lesson: LessonPackModel): string {
  if (!lesson.plan) return 'Cannot be planned yet';
  const short = new Set(lesson.plan.shortfalls.map((s) => s.group ?? 0)).size;
  return short ? `${plural(short, 'group')} short` : '';
}

/** The overview pages' nodes. */
export function unitOverview(
  unit: UnitOverviewModel,
  lessons: readonly LessonPackModel[],
  print: PrintContext,
): Content[] {
  const tz = print.timezone;
  const overview = markdownToContent(unit.overview);
  const classes = [...new Set(lessons.map((l) => l.className))];
  const oneClass = classes.length <= 1;
  const rows = lessons.map((l) => [
    td(String(l.number), { alignment: 'right' }),
    td(`${shortDate(l.startsAt, tz).slice(0, -5)}, ${localClockTime(l.startsAt, tz)}`, {
      noWrap: true,
    }),
    td(oneClass ? l.title : `${l.title} (${l.className})`, { bold: true }),
    td(l.plan ? String(l.plan.groups.length) : '—', { alignment: 'right' }),
    td(lessonNote(l), { fontSize: 9.5, noWrap: true }),
  ]);
  return [
    { text: 'UNIT PACK', style: 'kicker' },
    { text: unit.title, style: 'title' },
    facts(
      [
        ['Year level', `Year ${unit.yearLevel}`],
        ['Learning area', unit.learningArea || 'Not set'],
        [
          'Term',
          [unit.term ? `Term ${unit.term}` : '', lessons[0]?.startsAt.slice(0, 4) ?? '']
            .filter(Boolean)
            .join(', ') || 'Not set',
        ],
        ['Written by', unit.ownerName],
        [
          'Lessons',
          oneClass && classes[0] ? `${lessons.length}, for ${classes[0]}` : String(lessons.length),
        ],
        ['School', print.schoolName],
      ],
      contentWidth(print.paper),
    ),
    { text: 'Overview', style: 'heading' },
    ...(overview.length ? overview : [{ text: 'No overview written.', italics: true }]),
    { text: 'Outcomes', style: 'heading' },
    ...(unit.outcomes.length
      ? unit.outcomes.map((o) => ({
          text: [{ text: `${o.code}  `, bold: true }, o.description],
          margin: [0, 0, 0, 2],
        }))
      : [{ text: 'No outcomes are linked to this unit yet.', italics: true }]),
    { text: 'Lessons', style: 'heading' },
    dataTable(
      ['auto', 'auto', '*', 'auto', 'auto'],
      [
        th('No.', { alignment: 'right' }),
        th('Date'),
        th('Lesson'),
        th('Groups', { alignment: 'right' }),
        th('Note'),
      ],
      rows,
    ),
  ];
}

/** The unit pack's content: one section for the overview, one per lesson. */
export function unitPackContent(
  unit: UnitOverviewModel,
  lessons: readonly LessonPackModel[],
  print: PrintContext,
  /** Pages printed after each lesson's own (its build instructions). */
  after: (lesson: LessonPackModel) => Content[] = () => [],
): ContentNode[] {
  return [
    {
      section: unitOverview(unit, lessons, print),
      header: pageHeader(print.paper, `Unit pack: ${unit.title}`),
    },
    ...lessons.map((l) => ({
      section: [...lessonPackContent(l, print), ...after(l)],
      header: pageHeader(print.paper, lessonHeading(l)),
    })),
  ];
}
