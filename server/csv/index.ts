/** The parts-list CSV of API.md: reader and writer. */
export { readPartsCsv, type PartsCsvResult } from './parts-reader.js';
export { writePartsCsv } from './parts-writer.js';
export { PARTS_COLUMNS, REQUIRED_COLUMNS } from './columns.js';
export { writeCsv, type CsvCell } from './writer.js';
