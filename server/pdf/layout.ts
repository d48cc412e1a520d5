/**
 * Page geometry, type styles and the small building blocks every printable shares. Print-first:
 * black text, thin light-grey rules, no filled areas, body text at 11 pt so a sheet on a tray
 * reads at arm's length.
 */
import type { PaperSize } from '../../shared/schemas/school.js';
import type {
  Content,
  ContentNode,
  DocumentDefinition,
  Margins,
  PageDecoration,
} from './content.js';
import { SYMBOL_FONT, TEXT_FONT, TICK_BOX, WARNING_SIGN } from './fonts.js';
import { keepRules, type Keep } from './keep.js';

/**
 * Paper sizes in PostScript points (1/72 in). A4 is 210 × 297 mm (ISO 216): 210 / 25.4 × 72 =
 * 595.28, 297 / 25.4 × 72 = 841.89. US Letter is 8.5 × 11 in (ANSI/ASME Y14.1): 612 × 792.
 */
export const PAGE_SIZES: Record<PaperSize, { width: number; height: number }> = {
  A4: { width: 595.28, height: 841.89 },
  Letter: { width: 612, height: 792 },
};

/** Left, top, right, bottom: room for the header and footer on every page. */
export const PAGE_MARGINS: Margins = [42, 58, 42, 50];

/** Light rules: visible on paper, never competing with the text. */
export const RULE_COLOUR = '#9a9a9a';
export const TEXT_COLOUR = '#000000';

/** Width left for content on a page of this paper. */
export function contentWidth(paper: PaperSize): number {
  return PAGE_SIZES[paper].width - PAGE_MARGINS[0] - PAGE_MARGINS[2];
}

export const STYLES: Record<string, ContentNode> = {
  kicker: { fontSize: 10, bold: true, characterSpacing: 0.6, margin: [0, 0, 0, 2] },
  title: { fontSize: 22, bold: true, lineHeight: 1.05, margin: [0, 0, 0, 4] },
  sectionTitle: { fontSize: 18, bold: true, margin: [0, 0, 0, 2] },
  heading: { fontSize: 13, bold: true, margin: [0, 10, 0, 4] },
  subheading: { fontSize: 11.5, bold: true, margin: [0, 6, 0, 2] },
  body: { fontSize: 11 },
  note: { fontSize: 9.5 },
  tableHead: { fontSize: 9.5, bold: true },
  cell: { fontSize: 10.5, lineHeight: 1.05 },
  decoration: { fontSize: 8.5 },
};

/** The page header: product name on the left, the document's subject (lesson title) right. */
export function pageHeader(paper: PaperSize, subject: string): PageDecoration {
  const width = contentWidth(paper);
  return () => ({
    margin: [PAGE_MARGINS[0], 22, PAGE_MARGINS[2], 0],
    stack: [
      {
        columns: [
          { text: 'Trayplan', bold: true, width: 'auto', style: 'decoration' },
          { text: subject, alignment: 'right', style: 'decoration' },
        ],
        columnGap: 12,
      },
      line(width, 0.5, 3),
    ],
  });
}

/** The page footer: when the file was generated (school time) and `Page N of M`. */
export function pageFooter(paper: PaperSize, generated: string): PageDecoration {
  const width = contentWidth(paper);
  return (page, pages) => ({
    margin: [PAGE_MARGINS[0], 12, PAGE_MARGINS[2], 0],
    stack: [
      line(width, 0.5, 0),
      {
        margin: [0, 4, 0, 0],
        columns: [
          { text: `Generated ${generated}`, style: 'decoration' },
          { text: `Page ${page} of ${pages}`, alignment: 'right', bold: true, style: 'decoration' },
        ],
      },
    ],
  });
}

/** A horizontal rule across `width` points. */
export function line(width: number, thickness = 0.5, marginTop = 4): ContentNode {
  return {
    margin: [0, marginTop, 0, 0],
    canvas: [
      {
        type: 'line',
        x1: 0,
        y1: 0,
        x2: width,
        y2: 0,
        lineWidth: thickness,
        lineColor: RULE_COLOUR,
      },
    ],
  };
}

/** An empty tick box (a glyph of the embedded symbol font, so it prints as a box). */
export function tickBox(size = 14, extra: ContentNode = {}): ContentNode {
  // The symbol font's tall line box would make every ticked row half as tall again.
  return { text: TICK_BOX, font: SYMBOL_FONT, fontSize: size, lineHeight: 0.62, ...extra };
}

/** A table cell holding one tick box. */
export function boxCell(size = 14, alignment: 'left' | 'center' = 'left'): ContentNode {
  return { stack: [tickBox(size)], alignment };
}

/** `☐ label` on one line. */
export function tickLine(label: Content, size = 14): ContentNode {
  return {
    columns: [tickBox(size, { width: size + 4 }), { stack: [label], margin: [0, 1, 0, 0] }],
    columnGap: 4,
    margin: [0, 1, 0, 1],
  };
}

/** A section's title with an optional line under it (each section starts on a new page). */
export function sectionTitle(text: string, lead?: Content, pageBreak = true): ContentNode {
  return {
    ...(pageBreak ? { pageBreak: 'before' } : {}),
    keep: 'with-next',
    stack: [
      { text, style: 'sectionTitle' },
      ...(lead === undefined
        ? []
        : [
            typeof lead === 'string' || Array.isArray(lead)
              ? { text: lead, style: 'body', margin: [0, 0, 0, 6] }
              : { stack: [lead], style: 'body', margin: [0, 0, 0, 6] },
          ]),
    ],
    margin: [0, 0, 0, 6],
  };
}

/** A framed warning: black frame, no fill, the warning sign before its title. */
export function warningBox(title: string, lines: Content[], fontSize = 11): ContentNode {
  return {
    keep: 'together',
    margin: [0, 4, 0, 8],
    table: {
      widths: ['*'],
      body: [
        [
          {
            stack: [
              {
                text: [
                  { text: `${WARNING_SIGN} `, font: SYMBOL_FONT },
                  { text: title, bold: true },
                ],
                fontSize: 12.5,
                margin: [0, 0, 0, 3],
              },
              ...lines.map((l) => ({
                stack: [l],
                fontSize,
                lineHeight: 1.1,
                margin: [0, 1, 0, 1],
              })),
            ],
          },
        ],
      ],
    },
    layout: {
      hLineWidth: () => 1.6,
      vLineWidth: () => 1.6,
      hLineColor: () => TEXT_COLOUR,
      vLineColor: () => TEXT_COLOUR,
      paddingLeft: () => 9,
      paddingRight: () => 9,
      paddingTop: () => 6,
      paddingBottom: () => 6,
    },
  };
}

/** Light horizontal rules between rows, a firmer one under the header, no vertical lines. */
export const ROWS_LAYOUT: ContentNode = {
  hLineWidth: (i: number, node: { table: { headerRows?: number; body: unknown[] } }) =>
    i === (node.table.headerRows ?? 0) ? 1 : i === 0 ? 0 : 0.5,
  vLineWidth: () => 0,
  hLineColor: (i: number, node: { table: { headerRows?: number } }) =>
    i === (node.table.headerRows ?? 0) ? TEXT_COLOUR : RULE_COLOUR,
  paddingLeft: (i: number) => (i === 0 ? 0 : 5),
  paddingRight: () => 5,
  paddingTop: () => 3,
  paddingBottom: () => 3,
};

/** A light grid, for tables filled in by hand. */
export const GRID_LAYOUT: ContentNode = {
  hLineWidth: () => 0.6,
  vLineWidth: () => 0.6,
  hLineColor: () => RULE_COLOUR,
  vLineColor: () => RULE_COLOUR,
  paddingLeft: () => 5,
  paddingRight: () => 5,
  paddingTop: () => 5,
  paddingBottom: () => 5,
};

/** The node marked to keep with its neighbours at a page break (see keep.ts). */
export function keep(how: Keep, node: ContentNode): ContentNode {
  return { ...node, keep: how };
}

/** A header cell. */
export function th(text: string, extra: ContentNode = {}): ContentNode {
  return { text, style: 'tableHead', ...extra };
}

/** A body cell. */
export function td(text: Content, extra: ContentNode = {}): ContentNode {
  return typeof text === 'string' || Array.isArray(text)
    ? { text, style: 'cell', ...extra }
    : { stack: [text], style: 'cell', ...extra };
}

/** A table with one header row (repeated on a new page) and rows kept whole. */
export function dataTable(
  widths: (number | string)[],
  head: ContentNode[],
  rows: ContentNode[][],
  layout: ContentNode = ROWS_LAYOUT,
): ContentNode {
  return {
    table: { headerRows: 1, dontBreakRows: true, widths, body: [head, ...rows] },
    layout,
    margin: [0, 2, 0, 8],
  };
}

/** Key–value facts in two columns, e.g. on the cover. */
export function facts(pairs: [string, string][], width: number): ContentNode {
  const half = Math.ceil(pairs.length / 2);
  const column = (items: [string, string][]) => ({
    width: (width - 16) / 2,
    table: {
      widths: [78, '*'],
      body: items.map(([k, v]) => [
        { text: k, style: 'tableHead', margin: [0, 1, 0, 0] },
        { text: v, style: 'body' },
      ]),
    },
    layout: {
      hLineWidth: () => 0,
      vLineWidth: () => 0,
      paddingLeft: () => 0,
      paddingRight: () => 6,
      paddingTop: () => 2,
      paddingBottom: () => 2,
    },
  });
  return { columns: [column(pairs.slice(0, half)), column(pairs.slice(half))], columnGap: 16 };
}

/** The document frame shared by every printable. */
export function documentFrame(
  paper: PaperSize,
  meta: { title: string; subject: string; generatedAt: string },
  content: Content[],
  decorations: { header?: PageDecoration; footer?: PageDecoration },
): DocumentDefinition {
  return {
    pageSize: PAGE_SIZES[paper],
    pageMargins: PAGE_MARGINS,
    info: {
      title: meta.title,
      subject: meta.subject,
      author: 'Trayplan',
      creator: 'Trayplan',
      producer: 'Trayplan (pdfmake)',
      creationDate: new Date(meta.generatedAt),
    },
    defaultStyle: { font: TEXT_FONT, fontSize: 11, color: TEXT_COLOUR, lineHeight: 1.15 },
    styles: STYLES,
    ...decorations,
    content,
    pageBreakBefore: keepRules(content, PAGE_MARGINS[1]),
  };
}
