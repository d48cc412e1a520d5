/**
 * The coverage matrix on paper: landscape in the school's paper size, outcomes down the side
 * grouped by strand, year level × term across, each cell the titles of its units and a gap
 * written out as "gap" (print is black and white: no colour carries meaning). Wide matrices are
 * split into tables of at most three year levels, each repeating the outcome column.
 */
import type { Coverage } from '../../shared/schemas/review.js';
import type { Content, ContentNode, DocumentDefinition } from './content.js';
import type { PrintContext } from './model.js';
import { generatedLabel } from './format.js';
import { GRID_LAYOUT, PAGE_MARGINS, PAGE_SIZES, STYLES, TEXT_COLOUR, th } from './layout.js';
import { TEXT_FONT } from './fonts.js';
import { columnHeading } from '../review/coverage-csv.js';

/** Year levels per table: four terms each, so at most twelve unit columns on a page. */
const YEARS_PER_TABLE = 3;

/** The job of a coverage PDF. */
export interface CoverageJob {
  kind: 'coverage';
  print: PrintContext;
  coverage: Coverage;
  /** "Endorsed units only" or "All units". */
  scope: string;
}

function landscape(print: PrintContext) {
  const page = PAGE_SIZES[print.paper];
  return { width: page.height, height: page.width };
}

function cell(units: { title: string }[]): ContentNode {
  if (units.length === 0) return { text: 'gap', italics: true, fontSize: 7.5 };
  return { stack: units.map((u) => ({ text: u.title, fontSize: 7.5 })) };
}

function table(coverage: Coverage, years: number[], width: number): ContentNode {
  const columns = coverage.columns.filter((c) => years.includes(c.yearLevel));
  const indexes = columns.map((c) => coverage.columns.indexOf(c));
  const outcomeWidth = Math.min(200, width * 0.28);
  const head = [th('Outcome'), ...columns.map((c) => th(columnHeading(c), { fontSize: 8 }))];
  const body: ContentNode[][] = [];
  let strand: string | null = null;
  for (const o of coverage.outcomes) {
    if (o.strand !== strand && o.strand !== '') {
      body.push([
        { text: o.strand, bold: true, fontSize: 9, colSpan: columns.length + 1 },
        ...columns.map(() => ({})),
      ]);
    }
    strand = o.strand;
    body.push([
      {
        stack: [
          { text: o.code, bold: true, fontSize: 8.5 },
          { text: o.description, fontSize: 7.5 },
        ],
      },
      ...indexes.map((i) => cell(o.cells[i]!.units)),
    ]);
  }
  return {
    table: {
      headerRows: 1,
      dontBreakRows: true,
      widths: [outcomeWidth, ...columns.map(() => '*')],
      body: [head, ...body],
    },
    layout: GRID_LAYOUT,
    margin: [0, 4, 0, 10],
  };
}

/** The document of a coverage job. */
export function coverageDocument(job: CoverageJob): DocumentDefinition {
  const { coverage, print } = job;
  const page = landscape(print);
  const width = page.width - PAGE_MARGINS[0] - PAGE_MARGINS[2];
  const years = [...new Set(coverage.columns.map((c) => c.yearLevel))];
  const gaps = coverage.outcomes.filter((o) => o.cells.every((c) => c.units.length === 0)).length;
  const content: Content[] = [
    { text: 'Outcome coverage', style: 'title' },
    {
      text: `${coverage.framework.name} · ${job.scope} · ${print.schoolName}`,
      style: 'body',
    },
    {
      text: `${coverage.outcomes.length} outcomes; ${gaps} covered in no column shown. A cell reading “gap” has no unit.`,
      style: 'note',
      margin: [0, 2, 0, 6],
    },
  ];
  if (years.length === 0) content.push({ text: 'No year levels to show.', style: 'body' });
  for (let i = 0; i < years.length; i += YEARS_PER_TABLE) {
    const chunk = years.slice(i, i + YEARS_PER_TABLE);
    content.push({ ...table(coverage, chunk, width), ...(i > 0 ? { pageBreak: 'before' } : {}) });
  }
  return {
    pageSize: page,
    pageMargins: [PAGE_MARGINS[0], 36, PAGE_MARGINS[2], PAGE_MARGINS[3]],
    info: {
      title: `Outcome coverage: ${coverage.framework.name}`,
      subject: coverage.framework.name,
      author: 'Trayplan',
      creator: 'Trayplan',
      producer: 'Trayplan (pdfmake)',
      creationDate: new Date(print.generatedAt),
    },
    defaultStyle: { font: TEXT_FONT, fontSize: 9, color: TEXT_COLOUR, lineHeight: 1.1 },
    styles: STYLES,
    footer: landscapeFooter(page.width, generatedLabel(print.generatedAt, print.timezone)),
    content,
  };
}

/** The shared footer is drawn for portrait widths; this one spans the landscape page. */
function landscapeFooter(pageWidth: number, generated: string) {
  return (page: number, pages: number): ContentNode => ({
    margin: [PAGE_MARGINS[0], 12, PAGE_MARGINS[2], 0],
    columns: [
      { text: `Generated ${generated}`, style: 'decoration' },
      { text: `Page ${page} of ${pages}`, alignment: 'right', bold: true, style: 'decoration' },
    ],
    width: pageWidth - PAGE_MARGINS[0] - PAGE_MARGINS[2],
  });
}
