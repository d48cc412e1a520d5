/**
 * Markdown (learning intentions, success criteria, relief notes, unit overviews) printed with
 * its structure: marked's lexer gives the CommonMark block and inline tokens, and each becomes a
 * pdfmake node. Headings, paragraphs, lists (nested, ordered with their start, task items),
 * quotes, code, rules and tables print; emphasis prints as italics, strong as bold; a link
 * prints as its text followed by its address, since paper cannot be clicked; raw HTML prints as
 * the text inside it.
 */
import { lexer, type Token, type Tokens } from 'marked';
import type { Content, ContentNode } from './content.js';
import { RULE_COLOUR } from './layout.js';
import { SYMBOL_FONT, TICK_BOX } from './fonts.js';

/** A run of text with its inline style, as pdfmake's `text: [...]` takes it. */
type Run = ContentNode & { text: string | Run[] };

const NAMED: Record<string, string> = {
  amp: '&',
  lt: '<',
  gt: '>',
  quot: '"',
  apos: "'",
  nbsp: '\u00a0',
  copy: '©',
  reg: '®',
  ndash: '–',
  mdash: '—',
  hellip: '…',
  lsquo: '‘',
  rsquo: '’',
  ldquo: '“',
  rdquo: '”',
  times: '×',
  deg: '°',
  middot: '·',
  bull: '•',
  minus: '−',
  frac12: '½',
  frac14: '¼',
};

/** Decodes the character references CommonMark decodes (numeric, and the common named ones). */
export function decodeEntities(text: string): string {
  return text.replace(
    /&(#x[0-9a-f]{1,6}|#[0-9]{1,7}|[a-z][a-z0-9]{1,31});/gi,
    (whole, ref: string) => {
      if (ref[0] === '#') {
        const code =
          ref[1] === 'x' || ref[1] === 'X' ? parseInt(ref.slice(2), 16) : Number(ref.slice(1));
        // CommonMark: code point 0 and invalid code points become U+FFFD.
        return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : '\ufffd';
      }
      return NAMED[ref] ?? whole;
    },
  );
}

function stripTags(html: string): string {
  return decodeEntities(html.replace(/<[^>]*>/g, ''));
}

/** Inline tokens → text runs. */
function inline(tokens: Token[] | undefined, style: ContentNode = {}): Run[] {
  const runs: Run[] = [];
  for (const token of tokens ?? []) {
    switch (token.type) {
      case 'strong':
        runs.push(...inline((token as Tokens.Strong).tokens, { ...style, bold: true }));
        break;
      case 'em':
        runs.push(...inline((token as Tokens.Em).tokens, { ...style, italics: true }));
        break;
      case 'del':
        runs.push(...inline((token as Tokens.Del).tokens, { ...style, decoration: 'lineThrough' }));
        break;
      case 'codespan':
        runs.push({
          text: decodeEntities((token as Tokens.Codespan).text),
          ...style,
          characterSpacing: 0.2,
        });
        break;
      case 'br':
        runs.push({ text: '\n', ...style });
        break;
      case 'link': {
        const link = token as Tokens.Link;
        runs.push(...inline(link.tokens, style));
        const label = link.text.trim();
        const href = link.href.replace(/^mailto:/i, '');
        if (href && href !== label) runs.push({ text: ` (${href})`, ...style });
        break;
      }
      case 'image': {
        const image = token as Tokens.Image;
        runs.push({
          text: image.text ? `[picture: ${image.text}]` : '[picture]',
          ...style,
          italics: true,
        });
        break;
      }
      case 'html':
        runs.push({ text: stripTags((token as Tokens.HTML).text), ...style });
        break;
      case 'escape':
        runs.push({ text: (token as Tokens.Escape).text, ...style });
        break;
      case 'text': {
        const t = token as Tokens.Text;
        if (t.tokens?.length) runs.push(...inline(t.tokens, style));
        // A soft line break prints as a space (CommonMark 6.13); a hard one came as `br`.
        else runs.push({ text: decodeEntities(t.text).replace(/\n/g, ' '), ...style });
        break;
      }
      default:
        if ('text' in token && typeof token.text === 'string') {
          runs.push({ text: decodeEntities(token.text), ...style });
        }
    }
  }
  return runs;
}

const HEADING_SIZES = [0, 14, 13, 12, 11.5, 11, 11];

function listNode(list: Tokens.List, depth: number): ContentNode {
  const items = list.items.map((item) => {
    const body = blocks(
      item.tokens.filter((t) => t.type !== 'checkbox'),
      depth + 1,
      true,
    );
    if (!item.task) return body.length === 1 ? body[0]! : { stack: body };
    // A task item prints its own box, ticked or empty, in place of the bullet.
    return {
      columns: [
        { text: item.checked ? '\u2611' : TICK_BOX, font: SYMBOL_FONT, width: 14, fontSize: 12 },
        { stack: body },
      ],
      columnGap: 2,
    };
  });
  const margin = [0, 1, 0, depth === 0 ? 5 : 1];
  if (list.ordered) {
    return { ol: items, start: typeof list.start === 'number' ? list.start : 1, margin };
  }
  const tasksOnly = list.items.every((i) => i.task);
  return tasksOnly
    ? { stack: items, margin }
    : { ul: items, markerColor: '#000000', type: depth === 0 ? 'disc' : 'circle', margin };
}

function blocks(tokens: Token[], depth: number, tight = false): Content[] {
  const out: Content[] = [];
  for (const token of tokens) {
    switch (token.type) {
      case 'space':
        break;
      case 'heading': {
        const h = token as Tokens.Heading;
        out.push({
          text: inline(h.tokens),
          bold: true,
          fontSize: HEADING_SIZES[h.depth] ?? 11,
          margin: [0, out.length ? 6 : 0, 0, 2],
        });
        break;
      }
      case 'paragraph':
        out.push({
          text: inline((token as Tokens.Paragraph).tokens),
          margin: [0, 0, 0, tight ? 1 : 5],
        });
        break;
      case 'text': {
        // Text of a tight list item.
        const t = token as Tokens.Text;
        out.push({
          text: t.tokens?.length ? inline(t.tokens) : decodeEntities(t.text),
          margin: [0, 0, 0, 1],
        });
        break;
      }
      case 'list':
        out.push(listNode(token as Tokens.List, depth));
        break;
      case 'blockquote':
        out.push({
          table: {
            widths: ['*'],
            body: [[{ stack: blocks((token as Tokens.Blockquote).tokens, depth), italics: true }]],
          },
          layout: {
            hLineWidth: () => 0,
            vLineWidth: (i: number) => (i === 0 ? 2 : 0),
            vLineColor: () => RULE_COLOUR,
            paddingLeft: () => 8,
          },
          margin: [0, 0, 0, 5],
        });
        break;
      case 'code':
        out.push({
          text: (token as Tokens.Code).text,
          preserveLeadingSpaces: true,
          characterSpacing: 0.2,
          margin: [10, 0, 0, 5],
        });
        break;
      case 'hr':
        out.push({
          canvas: [
            { type: 'line', x1: 0, y1: 0, x2: 200, y2: 0, lineWidth: 0.5, lineColor: RULE_COLOUR },
          ],
          margin: [0, 3, 0, 6],
        });
        break;
      case 'table': {
        const table = token as Tokens.Table;
        const cell = (c: Tokens.TableCell, head: boolean) => ({
          text: inline(c.tokens),
          bold: head,
          alignment: c.align ?? 'left',
        });
        out.push({
          table: {
            headerRows: 1,
            widths: table.header.map(() => '*'),
            body: [
              table.header.map((c) => cell(c, true)),
              ...table.rows.map((r) => r.map((c) => cell(c, false))),
            ],
          },
          layout: {
            hLineWidth: () => 0.5,
            vLineWidth: () => 0,
            hLineColor: () => RULE_COLOUR,
          },
          margin: [0, 0, 0, 5],
        });
        break;
      }
      case 'html':
        if (stripTags((token as Tokens.HTML).text).trim()) {
          out.push({ text: stripTags((token as Tokens.HTML).text).trim(), margin: [0, 0, 0, 5] });
        }
        break;
      default:
        if ('text' in token && typeof token.text === 'string' && token.text.trim()) {
          out.push({ text: decodeEntities(token.text), margin: [0, 0, 0, 5] });
        }
    }
  }
  return out;
}

/**
 * Markdown → pdfmake nodes. Empty or blank input gives `[]`; the caller decides what to print
 * instead (usually "None written.").
 */
export function markdownToContent(markdown: string): Content[] {
  if (!markdown.trim()) return [];
  return blocks(lexer(markdown), 0);
}
