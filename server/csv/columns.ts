/**
 * The parts-list CSV format of API.md: its columns, the cell spellings it accepts, and the
 * formula guard shared by the reader and the writer.
 */
import type { PartValues } from '../../shared/schemas/kits.js';

/** Columns in the order the export writes them; the import takes them in any order. */
export const PARTS_COLUMNS = [
  'code',
  'name',
  'colour',
  'category',
  'qty',
  'compartment',
  'small',
  'charge_minutes',
] as const;
export type PartsColumn = (typeof PARTS_COLUMNS)[number];
export const REQUIRED_COLUMNS: readonly PartsColumn[] = ['code', 'name', 'qty'];

/** The field of a part each column fills. */
export const FIELD_OF: Record<PartsColumn, keyof PartValues> = {
  code: 'code',
  name: 'name',
  colour: 'colour',
  category: 'category',
  qty: 'qty',
  compartment: 'compartment',
  small: 'small',
  charge_minutes: 'chargeMinutes',
};
export const COLUMN_OF = Object.fromEntries(
  Object.entries(FIELD_OF).map(([column, field]) => [field, column]),
) as Record<keyof PartValues, PartsColumn>;

/** Text columns, which the formula guard applies to. */
export const TEXT_COLUMNS: ReadonlySet<PartsColumn> = new Set([
  'code',
  'name',
  'colour',
  'compartment',
]);

export const YES = new Set(['yes', 'true', '1']);
export const NO = new Set(['no', 'false', '0', '']);

/**
 * A spreadsheet runs a cell that starts with = + - or @ as a formula ("CSV injection", OWASP):
 * the export puts an apostrophe in front of such text, and the import takes one off again. Text
 * that already starts with apostrophes before such a character gets one more, so every value
 * survives the round trip exactly.
 */
// OWASP CSV Injection: =, +, -, @, tab (0x09) and carriage return (0x0D) can start a formula.
const FORMULA_START = /^'*[=+\-@\t\r]/;

export function guardFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export function unguardFormula(text: string): string {
  return text.startsWith("'") && FORMULA_START.test(text) ? text.slice(1) : text;
}
