/**
 * Section 1 of a lesson pack, the cover: what, who, where and when; anything short or wrong,
 * framed so it cannot be missed; the timeline with the pack-away start made prominent; the
 * learning intention, success criteria, outcomes and relief notes.
 */
import type { PrepPlan, PrepSegment } from '../../shared/prep/index.js';
import type { Content, ContentNode } from './content.js';
import {
  facts,
  keep,
  ROWS_LAYOUT,
  sectionTitle,
  TEXT_COLOUR,
  td,
  th,
  warningBox,
} from './layout.js';
import { listing, localClockTime, longDate, plural } from './format.js';
import { markdownToContent } from './markdown.js';
import { lessonLine, type PackView } from './pack-view.js';

/**
 * The shortfall summary: one sentence per short group (groups short of the same parts share
 * one), what would help, and where the details are.
 */
export function shortfallLines(view: PackView): { short: string[]; tips: string[] } {
  const { plan } = view;
  const byWho = new Map<string, string[]>();
  for (const s of plan.shortfalls) {
    const who = s.where === 'group' ? `${s.group}` : 'class';
    byWho.set(who, [
      ...(byWho.get(who) ?? []),
      `${s.needed - s.allocated} × ${view.part(s.partCode).name}`,
    ]);
  }
  const byItems = new Map<string, string[]>();
  for (const [who, items] of byWho) {
    const key = listing(items);
    byItems.set(key, [...(byItems.get(key) ?? []), who]);
  }
  const lines = [...byItems].map(([items, whos]) => {
    const groups = whos.filter((w) => w !== 'class');
    const parts = [
      ...(groups.length === 1 ? [`Group ${groups[0]} is short of ${items}.`] : []),
      ...(groups.length > 1 ? [`Groups ${listing(groups)} are each short of ${items}.`] : []),
      ...(whos.includes('class') ? [`The class tray is short of ${items}.`] : []),
    ];
    return parts.join(' ');
  });
  const groupTips = plan.suggestions.filter((s) => s.kind === 'groups').map((s) => s.message);
  const partTips = plan.suggestions.filter((s) => s.kind === 'part').map((s) => s.message);
  return { short: lines, tips: [...groupTips, ...(partTips.length ? [partTips.join(' ')] : [])] };
}

function groupSizesText(plan: PrepPlan): string {
  const sizes = plan.groups.map((g) => g.size);
  const distinct = [...new Set(sizes)];
  if (distinct.length === 1) return `${plural(sizes.length, 'group')} of ${distinct[0]}`;
  return `${plural(sizes.length, 'group')} (${listing(sizes.map(String))} students)`;
}

function segmentRow(view: PackView, s: PrepSegment): ContentNode[] {
  const packAway = s.kind === 'pack-away';
  const extra: ContentNode = packAway ? { bold: true, fontSize: 11.5 } : {};
  const what: Content = s.overrun
    ? [{ text: s.label }, { text: '  runs into pack-away', bold: true }]
    : s.label;
  return [
    td(view.clock(s.startsAt), { noWrap: true, ...extra }),
    td(what, extra),
    td(String(s.minutes), { alignment: 'right', ...extra }),
  ];
}

function timeline(view: PackView): ContentNode {
  const { timeline: t } = view.plan;
  const rows = t.segments.map((s) => segmentRow(view, s));
  const packRow = t.segments.findIndex((s) => s.kind === 'pack-away') + 1;
  return {
    stack: [
      { text: 'Timeline', style: 'heading', margin: [0, 0, 0, 2] },
      {
        table: {
          headerRows: 1,
          widths: ['auto', '*', 'auto'],
          body: [[th('From'), th('What'), th('Min', { alignment: 'right' })], ...rows],
        },
        layout: {
          ...ROWS_LAYOUT,
          // The row of the pack-away start gets a heavy rule above it, like a line on the clock.
          hLineWidth: (i: number) => (i === packRow ? 2 : i === 1 ? 1 : i === 0 ? 0 : 0.5),
          hLineColor: (i: number) => (i === packRow || i === 1 ? TEXT_COLOUR : '#9a9a9a'),
          paddingTop: () => 3,
          paddingBottom: () => 3,
        },
      },
      {
        text:
          `Planned ${t.plannedMinutes} of ${t.windowMinutes} minutes` +
          (t.slackMinutes >= 0 ? `, ${t.slackMinutes} to spare.` : `: ${-t.slackMinutes} over.`),
        style: 'note',
        margin: [0, 3, 0, 0],
      },
    ],
  };
}

function packAwayBanner(view: PackView): ContentNode {
  const { timeline: t } = view.plan;
  return {
    margin: [0, 6, 0, 6],
    table: {
      widths: ['*'],
      body: [
        [
          {
            stack: [
              {
                text: `Pack-away starts at ${view.clock(t.packAwayStartsAt)}`,
                fontSize: 17,
                bold: true,
              },
              {
                text: `${plural(t.packAwayMinutes, 'minute')} to put every part back before ${localClockTime(view.lesson.endsAt, view.print.timezone)}. Stop building then, finished or not.`,
                style: 'body',
              },
            ],
          },
        ],
      ],
    },
    layout: {
      hLineWidth: (i: number) => (i === 0 ? 3 : 1),
      vLineWidth: () => 0,
      hLineColor: () => TEXT_COLOUR,
      paddingLeft: () => 0,
      paddingTop: () => 5,
      paddingBottom: () => 5,
    },
  };
}

function markdownBlock(title: string, markdown: string, empty = 'None written.'): ContentNode {
  const body = markdownToContent(markdown);
  return {
    stack: [
      { text: title, style: 'heading' },
      ...(body.length ? body : [{ text: empty, italics: true }]),
    ],
  };
}

/** Everything that needs doing before or during the lesson, in one frame. */
function warnings(view: PackView): Content[] {
  const { plan } = view;
  if (!plan.shortfalls.length && !plan.warnings.length) return [];
  const lines: Content[] = [];
  if (plan.shortfalls.length) {
    const { short, tips } = shortfallLines(view);
    lines.push(...short.map((text) => ({ text, bold: true })));
    lines.push(...tips);
    lines.push({ text: 'Each short group’s pull sheet marks its missing parts.', italics: true });
    if (plan.warnings.length) lines.push({ text: 'Also check', bold: true, margin: [0, 4, 0, 0] });
  }
  lines.push(...plan.warnings.map((w) => w.message));
  return [
    warningBox(
      plan.shortfalls.length ? 'Not enough parts' : 'Check before the lesson',
      lines,
      10.5,
    ),
  ];
}

/**
 * The cover: page 1 holds what running the lesson needs (facts, warnings, pack-away, timeline,
 * learning intention and success criteria); page 2 the outcomes and the relief notes.
 */
export function cover(view: PackView): Content[] {
  const { lesson, plan, print } = view;
  const time = `${localClockTime(lesson.startsAt, print.timezone)} – ${localClockTime(lesson.endsAt, print.timezone)}`;
  const outcomes: Content[] = lesson.outcomes.length
    ? lesson.outcomes.map((o) => ({
        text: [{ text: `${o.code}  `, bold: true }, o.description],
        margin: [0, 0, 0, 3],
      }))
    : [{ text: 'No outcomes are linked to this unit yet.', italics: true }];
  return [
    { text: `Lesson pack · ${lesson.unitTitle}`.toUpperCase(), style: 'kicker' },
    { text: lesson.title, style: 'title' },
    {
      text: `Lesson ${lesson.number} of ${lesson.lessonCount} · ${lesson.className} · ${longDate(lesson.startsAt, print.timezone)}`,
      fontSize: 12.5,
      margin: [0, 0, 0, 8],
    },
    facts(
      [
        ['Time', lesson.periodName ? `${lesson.periodName}, ${time}` : time],
        ['Room', lesson.room || 'Not set'],
        [
          'Class',
          `${lesson.className}: ${plural(lesson.studentCount, 'student')}, ${plural(lesson.devices, 'device')}`,
        ],
        ['Groups', groupSizesText(plan)],
        ['Teacher', lesson.teachers.length ? listing(lesson.teachers) : 'Not set'],
        ['Relief teacher', lesson.reliefTeacher ?? 'None assigned'],
        ['Kit', `${lesson.kitTypeName}, ${plural(plan.totals.tubsUsed, 'tub')} in use`],
        ['Pieces', `${plan.totals.pieces} in ${plan.totals.lines} tray lines`],
      ],
      view.width,
    ),
    ...warnings(view),
    keep('together', packAwayBanner(view)),
    // The timeline beside the intention and criteria: moved whole rather than split.
    keep('together', {
      columns: [
        { width: view.width * 0.54, stack: [timeline(view)] },
        {
          width: '*',
          stack: [
            markdownBlock('Learning intention', lesson.learningIntention),
            markdownBlock('Success criteria', lesson.successCriteria),
          ],
          margin: [0, -10, 0, 0],
        },
      ],
      columnGap: 18,
    }),
    sectionTitle('Outcomes and relief notes', lessonLine(lesson, print.timezone)),
    { text: 'Outcomes', style: 'heading', margin: [0, 2, 0, 4] },
    ...outcomes,
    markdownBlock('Relief notes', lesson.reliefNotes, 'No relief notes.'),
  ];
}
