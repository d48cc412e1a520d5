/**
 * pdfmake document nodes, typed loosely on purpose: pdfmake's node shapes are many and
 * open-ended, and no type package is installed for 0.3. The builders keep to a small set
 * (text, stack, columns, table, ul/ol, svg, section, canvas) and the PDF tests read back what
 * they produce, which is where mistakes would show.
 */

/** Any pdfmake node: plain text, an object node, or a list of nodes. */
export type Content = string | ContentNode | Content[];

/** An object node such as `{ text }`, `{ table }` or `{ stack }` with its style properties. */
export interface ContentNode {
  [property: string]: unknown;
}

/** pdfmake's `[left, top, right, bottom]` margins. */
export type Margins = [number, number, number, number];

/** A header or footer callback: page number from 1, total pages. */
export type PageDecoration = (page: number, pages: number) => Content;

/** The document definition handed to `pdfmake.createPdf`. */
export interface DocumentDefinition {
  pageSize: { width: number; height: number };
  pageMargins: Margins;
  info: {
    title: string;
    author: string;
    subject?: string;
    creator: string;
    producer: string;
    creationDate?: Date;
  };
  defaultStyle: ContentNode;
  styles: Record<string, ContentNode>;
  header?: PageDecoration;
  footer?: PageDecoration;
  content: Content[];
  /** Asked about each node after a layout pass; `true` breaks the page before it (keep.ts). */
  pageBreakBefore?: (node: { startPosition?: unknown }) => boolean;
}
