/** Writes a parts list as the CSV of API.md, a file the importer reads back unchanged. */
import type { PartValues } from '../../shared/schemas/kits.js';
import { PARTS_COLUMNS } from './columns.js';
import { writeCsv } from './writer.js';

/**
 * The parts in order, under a header of every column, through the one CSV writer (RFC 4180,
 * formula guard). A UTF-8 byte-order mark leads, so spreadsheets read names with accents correctly.
 */
export function writePartsCsv(parts: readonly PartValues[]): string {
  const rows = parts.map((p) => [
    p.code,
    p.name,
    p.colour ?? '',
    p.category,
    p.qty,
    p.compartment ?? '',
    p.small ? 'yes' : 'no',
    p.chargeMinutes,
  ]);
  return writeCsv(PARTS_COLUMNS, rows, { bom: true });
}
