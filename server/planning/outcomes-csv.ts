/**
 * Reads an outcomes CSV (RFC 4180: quoted fields, doubled quotes, line breaks inside quotes, CRLF
 * or LF, UTF-8 with or without a byte-order mark) into rows, or lists every bad row with its line
 * and column. Nothing is stored here: the route imports only a file without problems.
 */
import { parse } from 'csv-parse/sync';
import type { ApiErrorDetail } from '../../shared/schemas/common.js';
import {
  OUTCOME_CSV_COLUMNS,
  OUTCOME_CSV_MAX_ROWS,
  OUTCOME_CSV_REQUIRED,
  outcomeRowSchema,
  type OutcomeRow,
} from '../../shared/schemas/outcomes.js';

/** Beyond this many problems the list stops: a file this wrong is fixed as a whole. */
const MAX_PROBLEMS = 200;

export type OutcomesCsvResult =
  { ok: true; rows: OutcomeRow[] } | { ok: false; problems: ApiErrorDetail[] };

type Column = (typeof OUTCOME_CSV_COLUMNS)[number];
const FIELD: Record<Column, keyof OutcomeRow> = {
  code: 'code',
  description: 'description',
  strand: 'strand',
  year_band: 'yearBand',
};

function problem(line: number, column: string | undefined, message: string): ApiErrorDetail {
  return { path: 'file', line, ...(column ? { column } : {}), message };
}

/** Decodes UTF-8 strictly: a file saved in another encoding is refused, not imported garbled. */
function decode(bytes: Buffer): string | null {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return null;
  }
}

interface Parsed {
  record: string[];
  info: { lines: number };
}

export function readOutcomesCsv(bytes: Buffer): OutcomesCsvResult {
  const text = decode(bytes);
  if (text === null) {
    return {
      ok: false,
      problems: [
        problem(1, undefined, 'The file is not UTF-8 text. Save it as “CSV UTF-8” and try again.'),
      ],
    };
  }
  // One record delimiter for csv-parse: a CRLF inside a quoted field then reads as one line break,
  // and line numbers stay right for files that mix CRLF and LF.
  const normalised = text.replace(/\r\n/g, '\n');
  let records: Parsed[];
  try {
    records = parse(normalised, {
      bom: true,
      info: true,
      relax_column_count: true,
      skip_empty_lines: true,
      record_delimiter: '\n',
    }) as unknown as Parsed[];
  } catch (err) {
    const e = err as { lines?: number; message?: string };
    return {
      ok: false,
      problems: [
        problem(
          e.lines ?? 1,
          undefined,
          `The file is not valid CSV: ${e.message ?? 'unreadable'}.`,
        ),
      ],
    };
  }
  // A record ends on info.lines; the line breaks inside its quoted fields tell where it began.
  const startLine = (r: Parsed) =>
    r.info.lines - r.record.reduce((n, f) => n + (f.match(/\n/g)?.length ?? 0), 0);
  const [header, ...body] = records;
  if (!header)
    return {
      ok: false,
      problems: [
        problem(1, undefined, 'The file is empty. It needs a header row and at least one outcome.'),
      ],
    };

  const problems: ApiErrorDetail[] = [];
  const columns = header.record.map((h) => h.trim().toLowerCase());
  const index = new Map<Column, number>();
  columns.forEach((name, i) => {
    if (!(OUTCOME_CSV_COLUMNS as readonly string[]).includes(name)) {
      problems.push(
        problem(
          1,
          name || `column ${i + 1}`,
          `Unknown column “${header.record[i]}”. The columns are ${OUTCOME_CSV_COLUMNS.join(', ')}.`,
        ),
      );
    } else if (index.has(name as Column)) {
      problems.push(problem(1, name, `The column “${name}” appears twice.`));
    } else index.set(name as Column, i);
  });
  for (const required of OUTCOME_CSV_REQUIRED) {
    if (!index.has(required))
      problems.push(problem(1, required, `The header has no “${required}” column.`));
  }
  if (problems.length) return { ok: false, problems };
  if (body.length === 0)
    return {
      ok: false,
      problems: [problem(1, undefined, 'The file has a header but no outcomes.')],
    };
  if (body.length > OUTCOME_CSV_MAX_ROWS) {
    return {
      ok: false,
      problems: [
        problem(
          1,
          undefined,
          `The file has ${body.length} outcomes; at most ${OUTCOME_CSV_MAX_ROWS} can be imported at once.`,
        ),
      ],
    };
  }

  const rows: OutcomeRow[] = [];
  const firstLineOfCode = new Map<string, number>();
  for (const r of body) {
    if (problems.length >= MAX_PROBLEMS) break;
    const line = startLine(r);
    if (r.record.length !== columns.length) {
      problems.push(
        problem(
          line,
          undefined,
          `This row has ${r.record.length} fields; the header has ${columns.length}.`,
        ),
      );
      continue;
    }
    const raw = { code: '', description: '', strand: '', yearBand: '' };
    for (const [column, i] of index) raw[FIELD[column]] = r.record[i] ?? '';
    const parsed = outcomeRowSchema.safeParse(raw);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const field = String(issue.path[0]);
        const column = OUTCOME_CSV_COLUMNS.find((c) => FIELD[c] === field);
        problems.push(problem(line, column, issue.message));
      }
      continue;
    }
    const earlier = firstLineOfCode.get(parsed.data.code);
    if (earlier !== undefined) {
      problems.push(
        problem(line, 'code', `The code ${parsed.data.code} is already on line ${earlier}.`),
      );
      continue;
    }
    firstLineOfCode.set(parsed.data.code, line);
    rows.push(parsed.data);
  }
  if (problems.length >= MAX_PROBLEMS) {
    problems.push(
      problem(1, undefined, `Stopped after ${MAX_PROBLEMS} problems; fix these and import again.`),
    );
  }
  return problems.length ? { ok: false, problems } : { ok: true, rows };
}
