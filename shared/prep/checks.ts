/**
 * Rules between fields of the prep input. They read the input defensively (it may be raw and
 * partly malformed) so that `validatePrepInput` can list them next to shape errors: a teacher
 * fixing a lesson sees every problem at once.
 */
import { MAX_STOCK, MAX_WINDOW_MINUTES } from './limits.js';
import { isIanaTimeZone, LOCAL_DATE_TIME, localToInstant, minutesBetween } from './time.js';

/** A problem found by a cross-field rule. */
export interface CrossIssue {
  path: (string | number)[];
  message: string;
}

type Obj = Record<string, unknown>;

function isObj(v: unknown): v is Obj {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function arr(v: unknown): unknown[] {
  return Array.isArray(v) ? v : [];
}

function str(v: unknown): string | undefined {
  return typeof v === 'string' ? v : undefined;
}

function isRealDate(local: string): boolean {
  const m = LOCAL_DATE_TIME.exec(local);
  if (!m) return false;
  const [y, mo, d, h, mi] = m.slice(1, 6).map(Number) as number[];
  const t = new Date(Date.UTC(y!, mo! - 1, d!, h!, mi!));
  return (
    t.getUTCFullYear() === y &&
    t.getUTCMonth() === mo! - 1 &&
    t.getUTCDate() === d &&
    t.getUTCHours() === h &&
    t.getUTCMinutes() === mi
  );
}

/** Checks a local time in the zone; returns its instant, or null after recording an issue. */
function checkLocal(
  v: unknown,
  zone: string | undefined,
  path: (string | number)[],
  out: CrossIssue[],
): number | null {
  const s = str(v);
  // Malformed strings are reported by the schema itself.
  if (s === undefined || !LOCAL_DATE_TIME.test(s)) return null;
  const year = Number(s.slice(0, 4));
  if (!isRealDate(s) || year < 2000 || year > 2199) {
    out.push({ path, message: `${s} is not a real date and time between 2000 and 2199.` });
    return null;
  }
  if (zone === undefined) return null;
  const ms = localToInstant(s, zone);
  if (ms === null) {
    out.push({
      path,
      message: `${s} does not exist in ${zone}: the clocks skip it when daylight time begins.`,
    });
  }
  return ms;
}

function checkLesson(input: Obj, zone: string | undefined, out: CrossIssue[]): void {
  const lesson = isObj(input['lesson']) ? input['lesson'] : {};
  const start = checkLocal(lesson['startsAt'], zone, ['lesson', 'startsAt'], out);
  const end = checkLocal(lesson['endsAt'], zone, ['lesson', 'endsAt'], out);
  if (start === null || end === null) return;
  const minutes = minutesBetween(start, end);
  if (end <= start) {
    out.push({ path: ['lesson', 'endsAt'], message: 'The lesson must end after it starts.' });
  } else if (minutes > MAX_WINDOW_MINUTES) {
    out.push({
      path: ['lesson', 'endsAt'],
      message: `The lesson is ${minutes} minutes long; at most ${MAX_WINDOW_MINUTES} minutes are allowed.`,
    });
  }
}

function checkParts(input: Obj, out: CrossIssue[]): Map<string, true> {
  const codes = new Map<string, true>();
  arr(input['parts']).forEach((p, i) => {
    const code = isObj(p) ? str(p['code']) : undefined;
    if (code === undefined) return;
    if (codes.has(code)) {
      out.push({
        path: ['parts', i, 'code'],
        message: `Part code ${code} appears more than once in the parts list.`,
      });
    }
    codes.set(code, true);
  });
  return codes;
}

function checkTubs(input: Obj, codes: Map<string, true>, out: CrossIssue[]): void {
  const labels = new Set<string>();
  const ids = new Set<string>();
  const codeList = [...codes.keys()];
  arr(input['tubs']).forEach((t, i) => {
    if (!isObj(t)) return;
    const label = str(t['label'])?.trim();
    const id = str(t['id']);
    if (label !== undefined && label !== '') {
      if (labels.has(label)) {
        out.push({ path: ['tubs', i, 'label'], message: `${label} is booked more than once.` });
      }
      labels.add(label);
    }
    if (id !== undefined) {
      if (ids.has(id)) {
        out.push({ path: ['tubs', i, 'id'], message: `Tub id ${id} appears more than once.` });
      }
      ids.add(id);
    }
    checkStock(t['stock'], label || 'A tub', codes, codeList, ['tubs', i, 'stock'], out);
  });
}

// A local copy: an imported binding is read through a getter in some loaders, once per count.
const maxStock = MAX_STOCK;

/** A count's problem, or null for a whole number in [0, MAX_STOCK]. */
function countProblem(v: unknown): string | null {
  if (typeof v === 'number' && Number.isInteger(v) && v >= 0 && v <= maxStock) return null;
  if (typeof v !== 'number' || !Number.isFinite(v)) return 'Must be a number.';
  if (!Number.isInteger(v)) return 'Must be a whole number.';
  return v < 0 ? 'Must be at least 0.' : `Must be at most ${maxStock}.`;
}

/** Reads an own property only (a part code could be `constructor`). */
export function ownValue(o: Record<string, unknown>, key: string): unknown {
  const v = o[key];
  if (v === undefined || typeof v === 'number') return v;
  // `__proto__` as an own key (JSON.parse makes one) reads as the prototype through o[key].
  return Object.getOwnPropertyDescriptor(o, key)?.value;
}

/**
 * Checks a tub's counts by walking the parts list (fast lookups), then compares the number of
 * keys to find codes that are not in the parts list only when there are some.
 */
function checkStock(
  stock: unknown,
  label: string,
  codes: Map<string, true>,
  codeList: readonly string[],
  path: (string | number)[],
  out: CrossIssue[],
): void {
  if (!isObj(stock)) return;
  let found = 0;
  for (const code of codeList) {
    const v = ownValue(stock, code);
    if (v === undefined) continue;
    found++;
    const problem = countProblem(v);
    if (problem) out.push({ path: [...path, code], message: problem });
  }
  if (Object.keys(stock).length === found) return;
  for (const code of Object.keys(stock)) {
    if (codes.has(code)) continue;
    out.push({
      path: [...path, code],
      message: `${label} holds part code ${code}, which is not in the parts list.`,
    });
  }
}

function checkMaterials(input: Obj, codes: Map<string, true>, out: CrossIssue[]): void {
  arr(input['activities']).forEach((a, i) => {
    if (!isObj(a)) return;
    arr(a['materials']).forEach((m, j) => {
      if (!isObj(m)) return;
      const path = ['activities', i, 'materials', j];
      const code = m['partCode'];
      const consumable = m['consumable'];
      const hasPart = code !== undefined && code !== null;
      const hasConsumable = consumable !== undefined && consumable !== null;
      if (hasPart === hasConsumable) {
        out.push({ path, message: 'A material is either a part (partCode) or a consumable.' });
      } else if (typeof code === 'string' && !codes.has(code)) {
        out.push({
          path: [...path, 'partCode'],
          message: `Part code ${code} is not in the parts list.`,
        });
      }
    });
  });
}

/** Every cross-field problem of a (possibly malformed) prep input, in input order. */
export function crossCheck(raw: unknown): CrossIssue[] {
  const out: CrossIssue[] = [];
  if (!isObj(raw)) return out;
  const tz = str(raw['timezone']);
  const zone = tz !== undefined && isIanaTimeZone(tz) ? tz : undefined;
  checkLesson(raw, zone, out);
  const codes = checkParts(raw, out);
  checkTubs(raw, codes, out);
  checkMaterials(raw, codes, out);
  arr(raw['earlierSameDay']).forEach((e, i) => {
    if (isObj(e)) checkLocal(e['endsAt'], zone, ['earlierSameDay', i, 'endsAt'], out);
  });
  return out;
}
