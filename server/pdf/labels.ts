/**
 * Tray labels: one per group tray, ten to a sheet (two columns of five), each with the group
 * number, home tub, controller label, piece count and a QR code of that group's tray page, with
 * the short code to type at /tray printed under it. The sheet layouts are the common 2 × 5 label sheets (from memory): on A4,
 * labels of 99.1 × 57 mm with 2.5 mm between the columns; on Letter, 4 × 2 in labels with
 * 0.5 in top margin and 3/16 in between the columns.
 */
import type { PrepGroup } from '../../shared/prep/index.js';
import type { PaperSize } from '../../shared/schemas/school.js';
import type { Content, ContentNode, DocumentDefinition } from './content.js';
import { PAGE_SIZES, RULE_COLOUR, STYLES } from './layout.js';
import { SYMBOL_FONT, TEXT_FONT, WARNING_SIGN } from './fonts.js';
import { plural, shortDate } from './format.js';
import type { LessonPackModel, PrintContext } from './model.js';
import { groupController, packView, type PackView } from './pack-view.js';
import { qrSvg } from './qr.js';

const MM = 72 / 25.4;

/** Where the labels sit on a sheet, in points from the top-left corner of the page. */
export interface LabelGrid {
  width: number;
  height: number;
  columns: number;
  rows: number;
  /** Top-left corner of each label, row by row. */
  slots: { x: number; y: number }[];
}

/** The label sheet of a paper size. */
export function labelGrid(paper: PaperSize): LabelGrid {
  const page = PAGE_SIZES[paper];
  const spec =
    paper === 'A4'
      ? { width: 99.1 * MM, height: 57 * MM, gap: 2.5 * MM }
      : { width: 4 * 72, height: 2 * 72, gap: 0.1875 * 72 };
  const columns = 2;
  const rows = 5;
  const left = (page.width - columns * spec.width - (columns - 1) * spec.gap) / 2;
  const top = (page.height - rows * spec.height) / 2;
  const slots: { x: number; y: number }[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < columns; c++) {
      slots.push({ x: left + c * (spec.width + spec.gap), y: top + r * spec.height });
    }
  }
  return { width: spec.width, height: spec.height, columns, rows, slots };
}

/** Inside margin of a label: printers cannot print to the very edge of a die-cut label. */
const PAD = 12;

/** `text`, cut at a word to at most `max` characters with an ellipsis. */
function clip(text: string, max: number): string {
  if (text.length <= max) return text;
  const cut = text.slice(0, max - 1);
  return `${cut.slice(0, Math.max(cut.lastIndexOf(' '), max / 2)).trimEnd()}…`;
}

function labelNode(
  grid: LabelGrid,
  slot: { x: number; y: number },
  view: PackView,
  group: PrepGroup,
  url: string,
  code: string,
): ContentNode[] {
  const { lesson, print } = view;
  const short = view.plan.shortfalls.some((s) => s.group === group.number);
  // Room under the code for the short code a group can type instead of scanning.
  const qrSize = Math.min(grid.height - 2 * PAD - 24, 104);
  const textWidth = grid.width - 3 * PAD - qrSize;
  const field = (label: string, value: string): ContentNode => ({
    text: [
      { text: `${label}  `, fontSize: 9 },
      { text: value, bold: true, fontSize: 12 },
    ],
    margin: [0, 0, 0, 1],
  });
  return [
    {
      // A light cut guide for plain paper; on label sheets it falls on the die-cut edge.
      absolutePosition: { x: slot.x, y: slot.y },
      canvas: [
        {
          type: 'rect',
          x: 0,
          y: 0,
          w: grid.width,
          h: grid.height,
          r: 6,
          lineWidth: 0.4,
          lineColor: RULE_COLOUR,
          dash: { length: 2, space: 2 },
        },
      ],
    },
    {
      absolutePosition: { x: slot.x + PAD, y: slot.y + PAD - 2 },
      columns: [
        {
          width: textWidth,
          stack: [
            { text: `Group ${group.number}`, fontSize: 22, bold: true, lineHeight: 1 },
            {
              text: `${plural(group.size, 'student')} · ${plural(group.pieces, 'piece')} in the tray`,
              fontSize: 9.5,
              margin: [0, 0, 0, 3],
            },
            field('Home tub', group.homeTub ?? 'none'),
            field('Controller', groupController(view, group)),
            ...(short
              ? [
                  {
                    text: [
                      { text: `${WARNING_SIGN} `, font: SYMBOL_FONT },
                      'Short: see the pull sheet',
                    ],
                    bold: true,
                    fontSize: 9,
                    margin: [0, 1, 0, 0],
                  },
                ]
              : []),
            {
              text: `${lesson.className} · ${shortDate(lesson.startsAt, print.timezone)} · ${clip(lesson.title, 34)}`,
              fontSize: 7.5,
              margin: [0, 3, 0, 0],
            },
          ],
        },
        {
          width: qrSize,
          stack: [
            { svg: qrSvg(url), width: qrSize, height: qrSize },
            { text: 'Scan, or type at /tray', fontSize: 7, alignment: 'center' },
            { text: code, fontSize: 12, bold: true, alignment: 'center', characterSpacing: 1 },
          ],
        },
      ],
      columnGap: PAD,
    },
  ];
}

/**
 * The label sheets of a lesson; `groupUrls[i]` is encoded on group i + 1's label and
 * `groupCodes[i]` printed under it.
 */
export function labelsDocument(
  lesson: LessonPackModel & { plan: NonNullable<LessonPackModel['plan']> },
  groupUrls: readonly string[],
  groupCodes: readonly string[],
  print: PrintContext,
): DocumentDefinition {
  const grid = labelGrid(print.paper);
  const perSheet = grid.slots.length;
  const view = packView(lesson, lesson.plan, print);
  const content: Content[] = [];
  lesson.plan.groups.forEach((group, i) => {
    const slot = i % perSheet;
    if (slot === 0 && i > 0) content.push({ text: '', pageBreak: 'before' });
    content.push(
      ...labelNode(grid, grid.slots[slot]!, view, group, groupUrls[i]!, groupCodes[i] ?? ''),
    );
  });
  return {
    pageSize: PAGE_SIZES[print.paper],
    pageMargins: [0, 0, 0, 0],
    info: {
      title: `Tray labels: ${lesson.title}`,
      subject: `${lesson.unitTitle}, lesson ${lesson.number}`,
      author: 'Trayplan',
      creator: 'Trayplan',
      producer: 'Trayplan (pdfmake)',
      creationDate: new Date(print.generatedAt),
    },
    defaultStyle: { font: TEXT_FONT, fontSize: 10, color: '#000000', lineHeight: 1.1 },
    styles: STYLES,
    content,
  };
}
