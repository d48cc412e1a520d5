/**
 * Reads a parts-list CSV (RFC 4180, the format of API.md) into parts, or into every problem it
 * has, each with the line it starts on and its column. Nothing here touches the database: the
 * route imports the parts only when the list of problems is empty.
 */
import { CsvError, parse } from 'csv-parse/sync';
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

export interface PartsCsvResult {
  parts: PartValues[];
  /** Every problem found; when any, nothing may be imported. `path` is empty (a file, not JSON). */
  errors: ApiErrorDetail[];
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

/** Splits the text into records with the (1-based) line each one starts on. */
function records(text: string): Row[] {
  // One kind of line break for the parser: CRLF, LF and a lone CR all end a line (RFC 4180 §2
  // writes CRLF; files saved on other systems use LF). A line break inside quotes becomes LF.
  const normalised = text.replace(/\r\n?/g, '\n');
  let parsed: { record: string[]; info: { lines: number }; raw: string }[];
  try {
    // With `info` and `raw` set, csv-parse returns wrapped records; its types do not say so.
    parsed = parse(normalised, {
      bom: true,
      info: true,
      raw: true,
      record_delimiter: '\n',
      relax_column_count: true,
      skip_empty_lines: true,
    }) as unknown as typeof parsed;
  } catch (err) {
    if (err instanceof CsvError) {
      const line = typeof err['lines'] === 'number' ? err['lines'] : 1;
      const message =
        err.code === 'CSV_QUOTE_NOT_CLOSED'
          ? 'A quoted value is never closed: add the closing quote mark.'
          : 'A quote mark is out of place: put quotes around the whole value, ' +
            'and double any quote inside it ("").';
      throw new HttpError(
        422,
        'csv-invalid',
        `The file is not valid CSV (line ${line}). Nothing was imported.`,
        [problem(line, '', message)],
      );
    }
    throw err;
  }
  return parsed.map(({ record, info, raw }) => {
    // `info.lines` is where the record ends; `raw` holds its text, after any skipped blank lines.
    const body = raw.replace(/^\n+/, '').replace(/\n$/, '');
    return { line: info.lines - (body.match(/\n/g)?.length ?? 0), cells: record };
  });
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

/**
 * Reads the text of a parts-list CSV. Throws 413 over `MAX_PARTS` rows and 422 when the text is
 * not CSV at all; returns the parts, or every row problem (header problems on line 1).
 */
export function readPartsCsv(text: string): PartsCsvResult {
  const rows = records(text).filter((r) => r.cells.some((c) => c.trim() !== ''));
  const errors: ApiErrorDetail[] = [];
  const [header, ...data] = rows;
  if (!header)
    return {
      parts: [],
      errors: [problem(1, '', 'The file is empty: its first line must name the columns.')],
    };
  if (data.length > MAX_PARTS) {
    throw new HttpError(
      413,
      'too-many-rows',
      `The file has ${data.length} rows; a parts list has at most ` +
        `${MAX_PARTS.toLocaleString('en')}.`,
    );
  }
  const head = readHeader(header, errors);
  const { at } = head;
  if (data.length === 0)
    errors.push(problem(header.line, '', 'The file has a header but no parts below it.'));
  const parts: PartValues[] = [];
  const firstLine = new Map<string, number>();
  for (const row of data) {
    const part = readRow(row, head, errors);
    const rawCode = at.has('code') ? unguardFormula((row.cells[at.get('code')!] ?? '').trim()) : '';
    const code = part?.code ?? rawCode;
    if (code) {
      const seen = firstLine.get(code);
      if (seen !== undefined)
        errors.push(problem(row.line, 'code', `The code ${code} is already used on line ${seen}.`));
      else firstLine.set(code, row.line);
    }
    if (part) parts.push(part);
  }
  return { parts: errors.length ? [] : parts, errors };
}
