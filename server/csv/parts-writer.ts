/** Writes a parts list as the CSV of API.md, a file the importer reads back unchanged. */
import { stringify } from 'csv-stringify/sync';
import type { PartValues } from '../../shared/schemas/kits.js';
import { guardFormula, PARTS_COLUMNS } from './columns.js';

/**
 * The parts in order, under a header of every column. RFC 4180 §2: CRLF between records, and
 * a field holding a comma, a quote or a line break is quoted with inner quotes doubled. A UTF-8
 * byte-order mark leads, so spreadsheets read names with accents correctly.
 */
export function writePartsCsv(parts: readonly PartValues[]): string {
  const rows = parts.map((p) => [
    guardFormula(p.code),
    guardFormula(p.name),
    guardFormula(p.colour ?? ''),
    p.category,
    String(p.qty),
    guardFormula(p.compartment ?? ''),
    p.small ? 'yes' : 'no',
    p.chargeMinutes === null ? '' : String(p.chargeMinutes),
  ]);
  return stringify(rows, {
    header: true,
    columns: [...PARTS_COLUMNS],
    bom: true,
    record_delimiter: 'windows',
    // Quote a value holding a lone LF or CR too, not only one holding CRLF.
    quote_record_delimiter: true,
  });
}
