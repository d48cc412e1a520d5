/**
 * Section 6 of a lesson pack, pack-away: the return map of borrowed parts, a count-back
 * checklist per tub (one column per tub: how many of each part go back into it), and a
 * missing-parts log to fill in by hand and record afterwards as a pack-away audit.
 */
import { naturalCompare } from '../../shared/prep/index.js';
import type { Content, ContentNode } from './content.js';
import { SYMBOL_FONT, TICK_BOX } from './fonts.js';
import { dataTable, GRID_LAYOUT, keep, sectionTitle, td, th, tickLine } from './layout.js';
import { localClockTime, plural } from './format.js';
import { countBack, lessonLine, type PackView } from './pack-view.js';

/** Tub columns that fit beside the part name on A4 and Letter alike. */
export const TUBS_PER_GRID = 8;

/** Rows of the missing-parts log: as many as fill the page. */
export const MISSING_LOG_ROWS = { A4: 16, Letter: 14 } as const;

/** Grid cells are set tight (one line each) so a 20-odd part kit's grid fits its page. */
const GRID_CELL: ContentNode = { fontSize: 10, lineHeight: 1 };

function countCell(n: number | undefined): ContentNode {
  if (!n) return td('', { alignment: 'center' });
  return td(
    [
      { text: `${n} `, bold: true },
      { text: TICK_BOX, font: SYMBOL_FONT, fontSize: 11, lineHeight: 0.62 },
    ],
    {
      ...GRID_CELL,
      alignment: 'center',
      noWrap: true,
    },
  );
}

function countBackGrids(view: PackView): Content[] {
  const byTub = countBack(view.plan);
  const tubs = [...byTub.keys()].sort(naturalCompare);
  if (!tubs.length) return [{ text: 'No part leaves a tub in this lesson.', italics: true }];
  const controllers = new Map(view.lesson.tubs.map((t) => [t.label, t.controllerLabel]));
  const usedUp = new Set(view.lesson.usedUpParts);
  const codes = view.lesson.parts
    .map((p) => p.code)
    .filter((c) => tubs.some((t) => byTub.get(t)!.has(c)));
  const grids: Content[] = [];
  for (let i = 0; i < tubs.length; i += TUBS_PER_GRID) {
    const chunk = tubs.slice(i, i + TUBS_PER_GRID);
    const head = [
      th('Part'),
      th('Code'),
      ...chunk.map((t) =>
        th(controllers.get(t) ? `${t}\n${controllers.get(t)}` : t, { alignment: 'center' }),
      ),
    ];
    const rows = codes.map((code) => {
      const p = view.part(code);
      const note = [p.small ? 'small' : '', usedUp.has(code) ? 'some used up' : ''].filter(Boolean);
      return [
        td(
          [
            { text: p.name },
            ...(note.length ? [{ text: ` (${note.join(', ')})`, fontSize: 9 }] : []),
          ],
          GRID_CELL,
        ),
        td(code, { ...GRID_CELL, noWrap: true, fontSize: 9.5 }),
        ...chunk.map((t) => countCell(byTub.get(t)!.get(code))),
      ];
    });
    grids.push(
      dataTable(['*', 'auto', ...chunk.map(() => 40)], head, rows, {
        ...GRID_LAYOUT,
        paddingTop: () => 2.5,
        paddingBottom: () => 2.5,
      }),
    );
  }
  return grids;
}

/** Section 6: return map and count-back (one page), then the missing-parts log (one page). */
export function packAway(view: PackView): Content[] {
  const { plan, lesson, print } = view;
  const t = plan.timeline;
  const logRows = Array.from({ length: MISSING_LOG_ROWS[print.paper] }, () => [
    td(''),
    td(''),
    td(''),
    td(''),
    td(''),
    td(''),
  ]);
  return [
    sectionTitle('Pack-away', [
      { text: `Starts at ${view.clock(t.packAwayStartsAt)}`, bold: true },
      ` and takes ${plural(t.packAwayMinutes, 'minute')}, until ${localClockTime(lesson.endsAt, print.timezone)}.\n`,
      { text: lessonLine(lesson, print.timezone) },
    ]),
    keep('together', {
      stack: [
        { text: 'Return map', style: 'heading', margin: [0, 2, 0, 2] },
        ...(plan.borrows.length
          ? plan.borrows.map((b) => tickLine(b.message, 13))
          : [
              {
                text: 'Nothing was borrowed: every part goes back to its group’s home tub.',
                italics: true,
              },
            ]),
      ],
    }),
    { text: 'Count back into each tub', style: 'heading' },
    keep('with-next', {
      text: 'Each column is one tub: count each part back in and tick it. An empty cell means none of that part came from that tub.',
      style: 'note',
      margin: [0, 0, 0, 2],
    }),
    ...countBackGrids(view),
    sectionTitle(
      'Missing-parts log',
      'Write down every part that does not come back, then record it in Trayplan as a pack-away audit so each tub’s stock stays true.',
    ),
    dataTable(
      ['*', 60, 44, 60, 50, 90],
      [th('Part'), th('Code'), th('Count'), th('Tub'), th('Group'), th('Noted by')],
      logRows.map((r) => r.map((c) => ({ ...c, margin: [0, 4, 0, 4] }))),
      GRID_LAYOUT,
    ),
  ];
}
