/**
 * Sections 2 to 5 of a lesson pack: the prep checklist, one pull sheet per group, the class
 * and spares trays, and the device pairing table. Every line a person acts on has a tick box.
 */
import type { PrepGroup, PrepLine } from '../../shared/prep/index.js';
import type { Content, ContentNode } from './content.js';
import {
  boxCell,
  dataTable,
  GRID_LAYOUT,
  keep,
  sectionTitle,
  td,
  th,
  tickLine,
  warningBox,
} from './layout.js';
import { listing, plural, taskTime } from './format.js';
import { groupController, lessonLine, sourceLines, type PackView } from './pack-view.js';

/** Section 2: every prep task with its times, in the order to start them. */
export function checklist(view: PackView): Content[] {
  const { plan, lesson, print } = view;
  const when = (iso: string) => taskTime(iso, view.day, print.timezone);
  const rows = plan.tasks.map((t) => [
    boxCell(15),
    td(t.label, { bold: true }),
    td(plural(t.minutes, 'min', 'min'), { noWrap: true }),
    td(when(t.startBy), { bold: true, noWrap: true }),
    td(when(t.doneBy), { noWrap: true }),
  ]);
  const tubRows = lesson.tubs.map((t) => [
    td(t.label),
    td(t.controllerLabel ?? '—'),
    td(
      t.status === 'ready'
        ? 'Ready'
        : t.status === 'needs-sorting'
          ? 'Needs sorting'
          : t.status === 'on-loan'
            ? 'On loan'
            : 'Retired',
    ),
  ]);
  return [
    sectionTitle('Prep checklist', lessonLine(lesson, print.timezone)),
    rows.length
      ? dataTable(
          [22, '*', 'auto', 'auto', 'auto'],
          [th(''), th('Task'), th('Takes'), th('Start by'), th('Done by')],
          rows,
        )
      : { text: 'Nothing to prepare for this lesson.', italics: true },
    keep('with-previous', {
      text: 'Start each task by its start-by time so it is done when the lesson needs it. Charging times are from empty.',
      style: 'note',
      margin: [0, 0, 0, 8],
    }),
    ...(plan.warnings.length
      ? [
          keep('together', {
            stack: [
              { text: 'Also check', style: 'heading' },
              ...plan.warnings.map((w) => tickLine(w.message, 13)),
            ],
          }),
        ]
      : []),
    { text: 'Tubs booked', style: 'heading' },
    dataTable([80, 110, '*'], [th('Tub'), th('Controller'), th('Status')], tubRows),
  ];
}

function partCell(view: PackView, line: PrepLine): ContentNode {
  const p = view.part(line.partCode);
  const short = line.needed - line.allocated;
  return td([
    { text: p.name },
    ...(p.small ? [{ text: '  small part', style: 'note', italics: true }] : []),
    ...(short > 0 ? [{ text: `  SHORT ${short}`, bold: true, fontSize: 9.5 }] : []),
  ]);
}

function qtyCell(line: PrepLine): ContentNode {
  const text =
    line.allocated >= line.needed ? String(line.allocated) : `${line.allocated} of ${line.needed}`;
  return td(text, { alignment: 'right', bold: true, noWrap: true });
}

/** The parts table of a tray: out box, part, colour, compartment, quantity, source, back box. */
export function partsTable(
  view: PackView,
  lines: readonly PrepLine[],
  homeTub: string | null,
): ContentNode {
  const rows = lines.map((line) => {
    const p = view.part(line.partCode);
    return [
      boxCell(14),
      td(line.partCode, { noWrap: true }),
      partCell(view, line),
      td(p.colour ?? '—'),
      td(p.compartment ?? '—', { noWrap: true }),
      qtyCell(line),
      td(sourceLines(line, homeTub).join('\n'), { fontSize: 9 }),
      boxCell(14, 'center'),
    ];
  });
  return dataTable(
    [22, 'auto', '*', 'auto', 'auto', 'auto', 136, 26],
    [
      th('Out'),
      th('Code'),
      th('Part'),
      th('Colour'),
      th('Compartment'),
      th('Qty', { alignment: 'right' }),
      th('From'),
      th('Back'),
    ],
    rows,
  );
}

function consumablesTable(items: readonly { name: string; qty: number }[]): ContentNode {
  return dataTable(
    [22, '*', 'auto'],
    [th(''), th('Consumable'), th('Qty', { alignment: 'right' })],
    items.map((c) => [
      boxCell(14),
      td(c.name),
      td(String(c.qty), { alignment: 'right', bold: true }),
    ]),
  );
}

function pullSheet(view: PackView, group: PrepGroup): Content[] {
  const { plan, lesson, print } = view;
  const short = plan.shortfalls.filter((s) => s.where === 'group' && s.group === group.number);
  const borrows = plan.borrows.filter((b) => b.group === group.number);
  const facts = [
    plural(group.size, 'student'),
    `home tub ${group.homeTub ?? 'none'}`,
    `controller ${groupController(view, group)}`,
    plural(group.pieces, 'piece'),
  ].join(' · ');
  return [
    sectionTitle(`Group ${group.number} pull sheet`, [
      { text: `${facts}\n`, bold: true },
      { text: `${lessonLine(lesson, print.timezone)} · ` },
      { text: 'tick Out as a line goes into the tray, Back as it returns', italics: true },
    ]),
    ...(short.length
      ? [
          keep(
            'with-next',
            warningBox(`Group ${group.number} is short of parts`, [
              `Missing: ${listing(short.map((s) => `${s.needed - s.allocated} × ${view.part(s.partCode).name}`))}.`,
              ...plan.suggestions.filter((s) => s.kind === 'groups').map((s) => s.message),
            ]),
          ),
        ]
      : []),
    partsTable(view, group.lines, group.homeTub),
    // Never a page of its own: when it does not fit under the table, the last rows come along.
    keep('with-previous', {
      // Side by side, so a long parts list still leaves the sheet on one page.
      columns: [
        ...(borrows.length
          ? [
              {
                width: '*',
                stack: [
                  { text: 'Borrowed: return to their own tub', style: 'subheading' },
                  ...borrows.map((b) => tickLine(b.message.replace(/^Group \d+: r/, 'R'), 13)),
                ],
              },
            ]
          : []),
        ...(group.consumables.length
          ? [
              {
                width: '*',
                stack: [
                  { text: 'Consumables', style: 'subheading' },
                  ...group.consumables.map((c) => tickLine(`${c.qty} × ${c.name}`, 13)),
                ],
              },
            ]
          : []),
        // An empty third column keeps a lone list at half width, under the table's left side.
        ...(borrows.length && group.consumables.length ? [] : [{ width: '*', text: '' }]),
      ],
      columnGap: 18,
    }),
  ];
}

/** Section 3: one sheet per group. */
export function pullSheets(view: PackView): Content[] {
  return view.plan.groups.flatMap((g) => pullSheet(view, g));
}

/** Section 4: the class tray (shared) and the spares tray (small parts to replace losses). */
export function trays(view: PackView): Content[] {
  const { plan, lesson, print } = view;
  const { classTray, sparesTray } = plan;
  const classShort = plan.shortfalls.filter((s) => s.where === 'class');
  return [
    sectionTitle('Class tray and spares tray', lessonLine(lesson, print.timezone)),
    { text: 'Class tray', style: 'heading', margin: [0, 4, 0, 2] },
    keep('with-next', { text: 'Shared by the whole class; it stays at the front.', style: 'note' }),
    ...(classShort.length
      ? [
          keep(
            'with-next',
            warningBox(
              'The class tray is short',
              classShort.map((s) => s.message),
            ),
          ),
        ]
      : []),
    classTray.lines.length
      ? partsTable(view, classTray.lines, null)
      : {
          text: 'No parts in the class tray for this lesson.',
          italics: true,
          margin: [0, 2, 0, 6],
        },
    ...(classTray.consumables.length
      ? [
          { text: 'Class consumables', style: 'subheading' },
          consumablesTable(classTray.consumables),
        ]
      : []),
    { text: 'Spares tray', style: 'heading' },
    keep('with-next', {
      text: 'Spare small parts, to replace pieces lost during the lesson. Count them back in too.',
      style: 'note',
    }),
    sparesTray.lines.length
      ? partsTable(view, sparesTray.lines, null)
      : { text: 'No spares for this lesson.', italics: true },
  ];
}

/** Section 5: a table for pairing each group's device with its controller, filled in by hand. */
export function devices(view: PackView): Content[] {
  const { plan, lesson, print } = view;
  const rows = plan.groups.map((g) => [
    td(`Group ${g.number}`, { bold: true, margin: [0, 5, 0, 5] }),
    td(g.homeTub ?? '—', { margin: [0, 5, 0, 5] }),
    td(groupController(view, g), { bold: true, margin: [0, 5, 0, 5] }),
    td(''),
    boxCell(16, 'center'),
  ]);
  const short = plan.warnings.filter((w) => w.code === 'devices-short');
  return [
    sectionTitle('Device pairing', lessonLine(lesson, print.timezone)),
    keep('with-next', {
      text: `Each group pairs one device with the controller in its home tub. Write the device's name or number as it is paired. The class has ${plural(lesson.devices, 'device')}.`,
      style: 'body',
      margin: [0, 0, 0, 6],
    }),
    ...(short.length
      ? [
          keep(
            'with-next',
            warningBox(
              'Not enough devices',
              short.map((w) => w.message),
            ),
          ),
        ]
      : []),
    dataTable(
      [64, 70, 90, '*', 44],
      [
        th('Group'),
        th('Home tub'),
        th('Controller'),
        th('Device (write in)'),
        th('Paired', { alignment: 'center' }),
      ],
      rows,
      GRID_LAYOUT,
    ),
  ];
}
