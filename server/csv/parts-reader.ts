/**
 * Reads a parts-list CSV (RFC 4180, the format of API.md) into parts, or into its problems, each
 * with the line it starts on and its column. Nothing here touches the database: the route imports
 * the parts only when there is no problem. The text is parsed as a stream (csv-parse's stream
 * API) that stops at the limits and gives the event loop back every few hundred records, so a
 * large or hostile file neither holds other requests up nor grows an answer without bound.
 */
import { CsvError, parse, type Parser } from 'csv-parse';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import {
  MAX_PARTS,
  PART_CATEGORIES,
  partInputSchema,
  type PartValues,
} from '../../shared/schemas/kits.js';
import { HttpError } from '../http.js';
import {
  COLUMN_OF,
  FIELD_OF,
  NO,
  PARTS_COLUMNS,
  REQUIRED_COLUMNS,
  TEXT_COLUMNS,
  YES,
  unguardFormula,
  type PartsColumn,
} from './columns.js';

/** At most this many problems are listed (the count says how many there were). */
export const MAX_LISTED_PROBLEMS = 100;
/** A header wider than this is not a parts list (API.md names 8 columns); reading stops. */
export const MAX_COLUMNS = 64;
/** Characters of one record; a longer one is not a parts-list line (common practice, no published source). */
const MAX_RECORD_CHARS = 64 * 1024;
/** Records parsed between two turns of the event loop. */
const RECORDS_PER_TURN = 250;

export interface PartsCsvResult {
  parts: PartValues[];
  /**
   * The first `MAX_LISTED_PROBLEMS` problems; when any, nothing may be imported. `path` is empty
   * (a file, not JSON).
   */
  errors: ApiErrorDetail[];
  /** How many problems there were in all, and on how many lines. */
  problemCount: number;
  problemLines: number;
}

interface Row {
  line: number;
  cells: string[];
}

const problem = (line: number, column: string, message: string): ApiErrorDetail => ({
  path: '',
  line,
  column,
  message,
});

type Parsed = { record: string[]; info: { lines: number }; raw: string };

const notCsv = (err: CsvError): HttpError => {
  const line = typeof err['lines'] === 'number' ? err['lines'] : 1;
  const message =
    err.code === 'CSV_QUOTE_NOT_CLOSED'
      ? 'A quoted value is never closed: add the closing quote mark.'
      : err.code === 'CSV_MAX_RECORD_SIZE'
        ? 'This line is far too long for a parts list: is it the right file?'
        : 'A quote mark is out of place: put quotes around the whole value, ' +
          'and double any quote inside it ("").';
  return new HttpError(
    422,
    'csv-invalid',
    `The file is not valid CSV (line ${line}). Nothing was imported.`,
    [problem(line, '', message)],
  );
};

/** Yields the records of the text with the (1-based) line each one starts on. */
async function* records(text: string): AsyncGenerator<Row> {
  // One kind of line break for the parser: CRLF, LF and a lone CR all end a line (RFC 4180 §2
  // writes CRLF; files saved on other systems use LF). A line break inside quotes becomes LF.
  const normalised = text.replace(/\r\n?/g, '\n');
  // With `info` and `raw` set, csv-parse gives wrapped records; its types do not say so.
  const parser: Parser = parse({
    bom: true,
    info: true,
    raw: true,
    record_delimiter: '\n',
    relax_column_count: true,
    skip_empty_lines: true,
    max_record_size: MAX_RECORD_CHARS,
  });
  parser.end(normalised);
  let count = 0;
  try {
    for await (const parsed of parser as AsyncIterable<Parsed>) {
      const { record, info, raw } = parsed;
      // `info.lines` is where the record ends; `raw` holds its text, after any skipped blank lines.
      const body = raw.replace(/^\n+/, '').replace(/\n$/, '');
      yield { line: info.lines - (body.match(/\n/g)?.length ?? 0), cells: record };
      if (++count % RECORDS_PER_TURN === 0) await new Promise((done) => setImmediate(done));
    }
  } catch (err) {
    if (err instanceof CsvError) throw notCsv(err);
    throw err;
  } finally {
    // A reader that stopped early (a limit) ends the parse too.
    parser.destroy();
  }
}

interface Header {
  /** Each known column's index. */
  at: Map<PartsColumn, number>;
  /** Indexes of columns with no name (a spreadsheet's trailing empty columns). */
  unnamed: number[];
  width: number;
}

/** Reads the header row, adding the problems of the header itself to `errors`. */
function readHeader(row: Row, errors: ApiErrorDetail[]): Header {
  const at = new Map<PartsColumn, number>();
  const unnamed: number[] = [];
  row.cells.forEach((cell, i) => {
    const name = cell.trim().toLowerCase();
    if (name === '') return void unnamed.push(i);
    if (!(PARTS_COLUMNS as readonly string[]).includes(name)) {
      errors.push(
        problem(
          row.line,
          cell.trim(),
          `Unknown column "${cell.trim()}". The columns are ${PARTS_COLUMNS.join(', ')}.`,
        ),
      );
    } else if (at.has(name as PartsColumn)) {
      errors.push(problem(row.line, name, `The column "${name}" appears twice.`));
    } else {
      at.set(name as PartsColumn, i);
    }
  });
  for (const column of REQUIRED_COLUMNS) {
    if (!at.has(column))
      errors.push(problem(row.line, column, `Add a column named "${column}"; it is required.`));
  }
  return { at, unnamed, width: row.cells.length };
}

const WHOLE = /^\d+(\.0+)?$/;
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)$/;

/** Reads a cell into the value the part schema expects, or a message saying what is wrong. */
function readCell(column: PartsColumn, raw: string): { value: unknown } | { error: string } {
  const cell = raw.trim();
  if (TEXT_COLUMNS.has(column))
    return {
      value: cell === '' && column !== 'code' && column !== 'name' ? null : unguardFormula(cell),
    };
  if (column === 'category') {
    const name = cell.toLowerCase();
    if (name === '') return { value: 'other' };
    if ((PART_CATEGORIES as readonly string[]).includes(name)) return { value: name };
    return { error: `Unknown category "${cell}". Use one of ${PART_CATEGORIES.join(', ')}.` };
  }
  if (column === 'small') {
    const word = cell.toLowerCase();
    if (YES.has(word)) return { value: true };
    if (NO.has(word)) return { value: false };
    return { error: 'Write yes or no (true/false or 1/0 also work), or leave it empty for no.' };
  }
  // qty and charge_minutes: whole numbers.
  const what = column === 'qty' ? 'The quantity' : 'The charge time';
  if (cell === '')
    return column === 'qty' ? { error: 'Enter the quantity one tub holds.' } : { value: null };
  if (WHOLE.test(cell)) return { value: Number(cell) };
  if (!NUMBER.test(cell)) return { error: `${what} must be a whole number, like 12.` };
  if (Number(cell) < 0) return { error: `${what} cannot be negative.` };
  return { error: `${what} must be a whole number, not a fraction.` };
}

/** Reads one data row into part values, adding its problems to `errors`. */
function readRow(
  row: Row,
  { at, unnamed, width }: Header,
  errors: ApiErrorDetail[],
): PartValues | null {
  const before = errors.length;
  const extra = row.cells.slice(width).some((c) => c.trim() !== '');
  if (extra)
    errors.push(
      problem(
        row.line,
        '',
        `This row has ${row.cells.length} values; the header names only ${width} columns.`,
      ),
    );
  if (unnamed.some((i) => (row.cells[i] ?? '').trim() !== '')) {
    errors.push(
      problem(row.line, '', 'This row has a value in a column with no name in the header.'),
    );
  }
  const values: Record<string, unknown> = {};
  const bad = new Set<string>();
  for (const [column, index] of at) {
    const read = readCell(column, row.cells[index] ?? '');
    if ('error' in read) {
      errors.push(problem(row.line, column, read.error));
      bad.add(FIELD_OF[column]);
    } else {
      values[FIELD_OF[column]] = read.value;
    }
  }
  const checked = partInputSchema.safeParse(values);
  if (!checked.success) {
    for (const issue of checked.error.issues) {
      const field = String(issue.path[0] ?? '') as keyof PartValues;
      // A missing required column is reported once, on the header; a bad cell once, above.
      if (bad.has(field) || !at.has(COLUMN_OF[field])) continue;
      errors.push(problem(row.line, COLUMN_OF[field] ?? '', issue.message));
    }
  }
  return errors.length === before && checked.success ? checked.data : null;
}

/** Collects problems, listing the first `MAX_LISTED_PROBLEMS` and counting all. */
class Problems {
  readonly listed: ApiErrorDetail[] = [];
  count = 0;
  readonly lines = new Set<number>();
  push(...found: ApiErrorDetail[]): void {
    for (const p of found) {
      this.count++;
      this.lines.add(p.line ?? 0);
      if (this.listed.length < MAX_LISTED_PROBLEMS) this.listed.push(p);
    }
  }
  result(parts: PartValues[]): PartsCsvResult {
    return {
      parts: this.count ? [] : parts,
      errors: this.listed,
      problemCount: this.count,
      problemLines: this.lines.size,
    };
  }
}

const tooMany = () =>
  new HttpError(
    413,
    'too-many-rows',
    `The file has more than ${MAX_PARTS.toLocaleString('en')} rows, the most a parts list ` +
      'may have. Nothing was imported.',
  );

/**
 * Reads the text of a parts-list CSV. Throws 413 past `MAX_PARTS` rows (as soon as the row after
 * the last allowed one is read) and 422 when the text is not CSV; returns the parts, or the
 * problems (header problems on its line).
 */
export async function readPartsCsv(text: string): Promise<PartsCsvResult> {
  const problems = new Problems();
  const parts: PartValues[] = [];
  const firstLine = new Map<string, number>();
  let head: Header | undefined;
  let headerLine = 1;
  let rows = 0;
  for await (const row of records(text)) {
    if (!row.cells.some((c) => c.trim() !== '')) continue;
    if (!head) {
      headerLine = row.line;
      if (row.cells.length > MAX_COLUMNS) {
        problems.push(
          problem(
            row.line,
            '',
            `The first line has ${row.cells.length.toLocaleString('en')} columns; a parts list ` +
              `has at most ${PARTS_COLUMNS.length}: ${PARTS_COLUMNS.join(', ')}.`,
          ),
        );
        return problems.result([]);
      }
      const headerProblems: ApiErrorDetail[] = [];
      head = readHeader(row, headerProblems);
      problems.push(...headerProblems);
      continue;
    }
    if (++rows > MAX_PARTS) throw tooMany();
    const rowProblems: ApiErrorDetail[] = [];
    const part = readRow(row, head, rowProblems);
    const { at } = head;
    const rawCode = at.has('code') ? unguardFormula((row.cells[at.get('code')!] ?? '').trim()) : '';
    const code = part?.code ?? rawCode;
    if (code) {
      const seen = firstLine.get(code);
      if (seen !== undefined)
        rowProblems.push(
          problem(row.line, 'code', `The code ${code} is already used on line ${seen}.`),
        );
      else firstLine.set(code, row.line);
    }
    problems.push(...rowProblems);
    if (part && rowProblems.length === 0) parts.push(part);
  }
  if (!head) {
    problems.push(problem(1, '', 'The file is empty: its first line must name the columns.'));
  } else if (rows === 0) {
    problems.push(problem(headerLine, '', 'The file has a header but no parts below it.'));
  }
  return problems.result(parts);
}
