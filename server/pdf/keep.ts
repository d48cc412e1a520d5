/**
 * Where a pack's pages break. pdfmake lays the whole document out, then asks `pageBreakBefore`
 * about each node; answering yes for one node lays everything out again with a break before it.
 * These rules read the finished layout (each node's line positions) and move what would print
 * badly:
 * - a heading (style `heading` or `subheading`, or `keep: 'with-next'`) stays on the page of
 *   what follows it, and of the first rows of a table that follows it;
 * - a table, or a heading with its table and trailer, that fits on one page is never split
 *   when there is something above it on the page to move away from;
 * - a table that must split repeats its header (`headerRows`) and never leaves one or two rows
 *   alone on a page, nor its trailer (`keep: 'with-previous'`, e.g. a pull sheet's consumables)
 *   alone on a page: the last rows move over with it;
 * - a block marked `keep: 'together'` moves whole to the next page when it fits there.
 * Widow and orphan control (at least MIN_ROWS lines of a block either side of a break) is common
 * practice in print layout; there is no published source for the numbers.
 *
 * Sections that start on a new page do not affect each other's layout, so one pass applies the
 * first fix of every such region at once and one relayout follows: a pack settles in a few
 * passes whatever its size.
 */
import type { Content, ContentNode } from './content.js';

/** Table rows that must stay together at either side of a page break. */
export const MIN_ROWS = 3;

/** How a node keeps with its neighbours (a property pdfmake itself ignores). */
export type Keep = 'with-next' | 'with-previous' | 'together';

/** Gap under the page's top margin that still counts as the top of the page (a heading's margin). */
const TOP_SLACK = 24;
/** Room left unused when judging whether a block fits on a fresh page (estimates are rough). */
const FIT_SLACK = 8;
/** Line height assumed for a line whose own height is unknown (a paragraph broken across pages). */
const LINE = 14;
/** Relayouts at most; each adds at least one break, and a pack needs two or three. */
const MAX_PASSES = 12;

/** A line position pdfmake records for a node after a layout pass. */
interface Position {
  pageNumber: number;
  top: number;
  pageInnerHeight: number;
}

/** A document node as pdfmake leaves it after layout (the same object the builders made). */
interface LaidOut extends ContentNode {
  positions?: Position[];
  __height?: number;
  pageBreak?: string;
  pageBreakCalculated?: boolean;
  keep?: Keep;
}

interface Rule {
  kind: 'group' | 'table' | 'block';
  /** Sections between forced page breaks; a fix in one does not move another. */
  region: number;
  /** The node a break goes before to move the whole rule. */
  first: LaidOut;
  /** Everything the rule keeps on one page when it fits. */
  members: LaidOut[];
  /** For a group: what the headings keep with; for a table rule: the table. */
  anchor?: LaidOut;
  trailer?: LaidOut;
  /** A table rule whose table a heading already keeps (the group rule moves it whole). */
  headed?: boolean;
}

interface Decision {
  region: number;
  /** The node pdfmake is told to break before. */
  trigger: LaidOut;
  /** Nodes given a break as well (the other cells of a row that moves). */
  also: LaidOut[];
}

function isNode(c: unknown): c is LaidOut {
  return typeof c === 'object' && c !== null && !Array.isArray(c);
}

function isHeading(c: unknown): boolean {
  if (!isNode(c)) return false;
  return c.keep === 'with-next' || c.style === 'heading' || c.style === 'subheading';
}

function keepsWithPrevious(c: unknown): c is LaidOut {
  return isNode(c) && c.keep === 'with-previous';
}

function table(node: LaidOut): { headerRows: number; body: unknown[][] } | undefined {
  const t = node['table'] as { headerRows?: number; body?: unknown[][] } | undefined;
  return t?.body ? { headerRows: t.headerRows ?? 0, body: t.body } : undefined;
}

/** Finds the rules in a document's content, in document order. */
export function collectRules(content: Content[]): Rule[] {
  const rules: Rule[] = [];
  let region = 0;
  const walk = (items: Content[]) => {
    items.forEach((item, i) => {
      if (Array.isArray(item)) return walk(item);
      if (!isNode(item)) return;
      if (item.pageBreak === 'before' || item['section']) region++;
      const previous = items[i - 1];
      if (isHeading(item) && !isHeading(previous)) {
        let j = i;
        while (isHeading(items[j])) j++;
        const anchor = items[j];
        // A heading before a forced break keeps with nothing (it has nothing after it).
        if (isNode(anchor) && anchor.pageBreak !== 'before' && !anchor['section']) {
          const after = items[j + 1];
          const trailer = keepsWithPrevious(after) ? after : undefined;
          rules.push({
            kind: 'group',
            region,
            first: item,
            members: [...(items.slice(i, j + 1) as LaidOut[]), ...(trailer ? [trailer] : [])],
            anchor,
            ...(trailer ? { trailer } : {}),
          });
        }
      }
      if (table(item)) {
        const after = items[i + 1];
        const trailer = keepsWithPrevious(after) ? after : undefined;
        rules.push({
          kind: 'table',
          region,
          first: item,
          members: [item, ...(trailer ? [trailer] : [])],
          anchor: item,
          ...(trailer ? { trailer } : {}),
          headed: isHeading(previous),
        });
      }
      if (item.keep === 'together' || item.keep === 'with-previous') {
        rules.push({ kind: 'block', region, first: item, members: [item] });
      }
      // Columns and table cells are laid out side by side: their content is judged as a whole.
      if (Array.isArray(item['section'])) walk(item['section'] as Content[]);
      if (Array.isArray(item['stack'])) walk(item['stack'] as Content[]);
    });
  };
  walk(content);
  return rules;
}

/** Every node under `node` (itself included), cells and columns too. */
function descendants(node: unknown, out: LaidOut[] = []): LaidOut[] {
  if (Array.isArray(node)) {
    for (const n of node) descendants(n, out);
    return out;
  }
  if (!isNode(node)) return out;
  out.push(node);
  // pdfmake turns a section's list into a stack node as it lays the document out.
  for (const key of ['stack', 'columns', 'ul', 'ol', 'section']) {
    if (Array.isArray(node[key]) || isNode(node[key])) descendants(node[key], out);
  }
  const t = table(node);
  if (t) descendants(t.body, out);
  return out;
}

interface Extent {
  /** Per page: the highest line top and the lowest line bottom of the nodes there. */
  pages: Map<number, { top: number; bottom: number }>;
  innerHeight: number;
}

function extent(nodes: readonly LaidOut[]): Extent {
  const pages = new Map<number, { top: number; bottom: number }>();
  let innerHeight = 0;
  const add = (page: number, top: number, bottom: number) => {
    const e = pages.get(page);
    pages.set(
      page,
      e ? { top: Math.min(e.top, top), bottom: Math.max(e.bottom, bottom) } : { top, bottom },
    );
  };
  for (const node of nodes.flatMap((n) => descendants(n))) {
    const ps = node.positions ?? [];
    if (!ps.length) continue;
    innerHeight = ps[0]!.pageInnerHeight;
    const onePage = ps.every((p) => p.pageNumber === ps[0]!.pageNumber);
    // A node laid out on one page knows its height (margins included); one broken across
    // pages is measured line by line.
    if (onePage && node.__height !== undefined) {
      add(ps[0]!.pageNumber, ps[0]!.top, ps[0]!.top + node.__height);
    } else {
      for (const p of ps) add(p.pageNumber, p.top, p.top + LINE);
    }
  }
  return { pages, innerHeight };
}

function firstPage(nodes: readonly LaidOut[]): number | undefined {
  const pages = [...extent(nodes).pages.keys()];
  return pages.length ? Math.min(...pages) : undefined;
}

function lastPage(nodes: readonly LaidOut[]): number | undefined {
  const pages = [...extent(nodes).pages.keys()];
  return pages.length ? Math.max(...pages) : undefined;
}

/** Whether the nodes, laid out from the top of a fresh page, would fit on it. */
function fits(nodes: readonly LaidOut[]): boolean {
  const { pages, innerHeight } = extent(nodes);
  let height = 0;
  for (const { top, bottom } of pages.values()) height += bottom - top;
  return height + FIT_SLACK <= innerHeight;
}

/** Whether the node starts at the top of its page (a break before it would leave a blank page). */
function atPageTop(node: LaidOut, topMargin: number): boolean {
  const { pages } = extent([node]);
  const first = firstPage([node]);
  if (first === undefined) return true;
  return pages.get(first)!.top - topMargin < TOP_SLACK;
}

/** The document's nodes in the order pdfmake lays them out, for one layout pass. */
interface Order {
  nodes: LaidOut[];
  index: Map<LaidOut, number>;
}

function order(content: Content[]): Order {
  const nodes = descendants(content);
  return { nodes, index: new Map(nodes.map((n, i) => [n, i])) };
}

/**
 * The page the layout cursor is on once `node` is laid out. pdfmake records a line inside an
 * unbreakable block (a table row kept whole) where the block began, even when the block then
 * moves to the next page, so a row's own positions cannot say where it printed. The first node
 * laid out after it records where the cursor was, which is the page the row ended on; a node
 * that starts a new page of its own (a forced break, a new section) records the page after.
 */
function pageAfter(node: LaidOut, at: Order): number | undefined {
  const own = descendants(node);
  const last = at.index.get(own.at(-1)!);
  if (last === undefined) return undefined;
  let forced = false;
  for (let i = last + 1; i < at.nodes.length; i++) {
    const next = at.nodes[i]!;
    if (next.pageBreak === 'before' || next['section']) forced = true;
    const page = next.positions?.[0]?.pageNumber;
    if (page !== undefined) return forced ? page - 1 : page;
  }
  return lastPage(own);
}

/** The page each body row of a table printed on. */
function rowPages(node: LaidOut, at: Order): number[] {
  const t = table(node)!;
  const rows = t.body.slice(t.headerRows);
  const pages: number[] = [];
  rows.forEach((row, k) => {
    const cells = row.filter(isNode);
    const page = cells.length ? pageAfter(cells.at(-1)!, at) : undefined;
    pages.push(page ?? pages[k - 1] ?? firstPage([node]) ?? 0);
  });
  return pages;
}

const count = (pages: number[], page: number) => pages.filter((p) => p === page).length;

function breakBefore(rule: Rule, node: LaidOut): Decision {
  return { region: rule.region, trigger: node, also: [] };
}

function judgeGroup(rule: Rule, topMargin: number, at: Order): Decision | undefined {
  const anchor = rule.anchor!;
  const start = firstPage([rule.first]);
  if (start === undefined || atPageTop(rule.first, topMargin)) return undefined;
  let keptStart = firstPage([anchor]);
  let end = lastPage(rule.members);
  if (table(anchor)) {
    const rows = rowPages(anchor, at);
    if (rows.length) {
      keptStart = rows[Math.min(MIN_ROWS, rows.length) - 1];
      end = Math.max(end ?? 0, rows.at(-1)!);
    }
  }
  if (keptStart !== undefined && keptStart > start) return breakBefore(rule, rule.first);
  if (end !== undefined && end > start && fits(rule.members)) return breakBefore(rule, rule.first);
  return undefined;
}

function judgeTable(rule: Rule, topMargin: number, at: Order): Decision | undefined {
  const node = rule.anchor!;
  const rows = rowPages(node, at);
  const n = rows.length;
  if (!n) return undefined;
  const last = rows[n - 1]!;
  const spans = last > rows[0]!;
  const trailer = rule.trailer;
  // The trailer would start a page of its own, or spill over and then (moved whole) do so.
  const trailerAlone =
    trailer !== undefined &&
    ((firstPage([trailer]) ?? last) > last ||
      ((lastPage([trailer]) ?? last) > last && fits([trailer])));
  if (!rule.headed && !atPageTop(node, topMargin)) {
    if (spans && count(rows, rows[0]!) < MIN_ROWS) return breakBefore(rule, node);
    if ((spans || trailerAlone) && fits(rule.members)) return breakBefore(rule, node);
  }
  if (!((spans && count(rows, last) < MIN_ROWS) || trailerAlone)) return undefined;
  // Carry the last rows over: the row that starts them must not be first on its page already,
  // and the page it leaves must keep enough rows of its own.
  const r = n - MIN_ROWS;
  if (r < 1 || rows[r] !== rows[r - 1]) return undefined;
  if (rows.slice(0, r).filter((p) => p === rows[r - 1]).length < MIN_ROWS) return undefined;
  const t = table(node)!;
  const cells = (t.body[t.headerRows + r] ?? []).filter(isNode);
  // pdfmake asks only about laid-out nodes: a cell with text is the one to answer for.
  const trigger = cells.find((c) => c.positions?.length) ?? cells[0];
  if (!trigger) return undefined;
  return { region: rule.region, trigger, also: cells.filter((c) => c !== trigger) };
}

function judgeBlock(rule: Rule, topMargin: number): Decision | undefined {
  const start = firstPage([rule.first]);
  const end = lastPage([rule.first]);
  if (start === undefined || end === undefined || end === start) return undefined;
  if (atPageTop(rule.first, topMargin) || !fits([rule.first])) return undefined;
  return breakBefore(rule, rule.first);
}

/** The first fix of every region, in document order, for the current layout. */
export function decide(rules: readonly Rule[], topMargin: number, at: Order): Decision[] {
  const decided = new Map<number, Decision>();
  const owned = new Set<LaidOut>();
  for (const rule of rules) {
    if (decided.has(rule.region)) continue;
    const decision =
      rule.kind === 'group'
        ? judgeGroup(rule, topMargin, at)
        : rule.kind === 'table'
          ? judgeTable(rule, topMargin, at)
          : // A table's trailer moves with the table's last rows (the table rule), never alone.
            rule.first.keep === 'with-previous' && owned.has(rule.first)
            ? undefined
            : judgeBlock(rule, topMargin);
    if (rule.kind === 'table' && rule.trailer) owned.add(rule.trailer);
    if (decision) decided.set(rule.region, decision);
  }
  return [...decided.values()];
}

/** Whether pdfmake will still ask about this node in the current pass. */
function askable(node: LaidOut): boolean {
  const ps = node.positions ?? [];
  if (!ps.length || node.pageBreak === 'before' || node.pageBreakCalculated) return false;
  return !(node['text'] === '' && !node['listMarker']);
}

/** pdfmake's `pageBreakBefore` callback for a document with this content. */
export function keepRules(
  content: Content[],
  topMargin: number,
): (info: { startPosition?: unknown }) => boolean {
  const rules = collectRules(content);
  const sentinels = rules.map((r) => r.first);
  let seen: unknown;
  let passes = 0;
  let trigger: unknown;
  return (info) => {
    // A new layout pass gives every node new position arrays: judge that layout once.
    const sentinel = sentinels.find((s) => s.positions?.length);
    if (sentinel && sentinel.positions !== seen) {
      seen = sentinel.positions;
      trigger = undefined;
      if (++passes > MAX_PASSES) return false;
      let first = true;
      for (const d of decide(rules, topMargin, order(content))) {
        for (const node of d.also) node.pageBreak = 'before';
        // pdfmake itself breaks before the first node it will still ask about, then lays out
        // again; every other fix is set directly and takes effect in that same relayout.
        if (first && askable(d.trigger)) {
          trigger = d.trigger.positions![0];
          first = false;
        } else {
          d.trigger.pageBreak = 'before';
        }
      }
    }
    return trigger !== undefined && info.startPosition === trigger;
  };
}
