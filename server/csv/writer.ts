/**
 * The one CSV writer of every export. RFC 4180 §2: CRLF between records; a field holding a comma,
 * a quote or a line break is quoted with inner quotes doubled. Every text cell is guarded as
 * OWASP's "CSV Injection" page says: text a spreadsheet would run as a formula gets an apostrophe
 * in front (guardFormula), so an export never hands a spreadsheet a formula from user data.
 */
import { stringify } from 'csv-stringify/sync';
import { guardFormula } from './columns.js';

export type CsvCell = string | number | null | undefined;

export interface CsvOptions {
  /** Whether a UTF-8 byte-order mark leads (spreadsheets then read accents correctly). */
  bom?: boolean;
}

function cell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  // A number is ours, never user text: "-3" as a count is a number, not a formula.
  if (typeof value === 'number') return String(value);
  return guardFormula(value);
}

/** A header of `columns`, then one record per row. */
export function writeCsv(
  columns: readonly string[],
  rows: readonly (readonly CsvCell[])[],
  options: CsvOptions = {},
): string {
  return stringify(
    rows.map((row) => row.map(cell)),
    {
      header: true,
      columns: [...columns],
      bom: options.bom ?? false,
      record_delimiter: 'windows',
      // Quote a value holding a lone LF or CR too, not only one holding CRLF.
      quote_record_delimiter: true,
    },
  );
}
