/**
 * The coverage matrix as CSV (API.md): a header row, then one row per outcome, its code first,
 * and one column per year level and term holding the count of units in that cell. Written by
 * the one CSV writer (RFC 4180, text cells guarded against formulas as OWASP's "CSV Injection"
 * page says), with a UTF-8 byte-order mark so spreadsheets read accents correctly.
 */
import type { Coverage, CoverageColumn } from '../../shared/schemas/review.js';
import { writeCsv } from '../csv/writer.js';

/** A column's heading: "Foundation term 1", "Year 4 term 3". */
export function columnHeading(c: CoverageColumn): string {
  return `${c.yearLevel === 0 ? 'Foundation' : `Year ${c.yearLevel}`} term ${c.term}`;
}

export function coverageCsv(matrix: Coverage): string {
  return writeCsv(
    ['Outcome', ...matrix.columns.map(columnHeading)],
    matrix.outcomes.map((o) => [o.code, ...o.cells.map((c) => c.units.length)]),
    { bom: true },
  );
}
