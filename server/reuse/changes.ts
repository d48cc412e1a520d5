/**
 * Short words for what changed between two snapshots (server/reuse/snapshot.ts): "group size
 * 3 → 4", "added activity Test run", "Drive motor 2 → 3 per group". Pure, so the history of an
 * edit and the list of upstream changes say things the same way.
 */
import type {
  ActivitySnapshot,
  LessonSnapshot,
  MaterialSnapshot,
  UnitFieldsSnapshot,
  UnitSnapshot,
} from './snapshot.js';

/** The longest summary kept; longer ones end in "…" (the rest is in the unit itself). */
export const SUMMARY_MAX = 500;

export function clip(text: string, max = SUMMARY_MAX): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

/** A short value in quotes-free words: long text is only said to have changed. */
function quote(value: string): string {
  return value === '' ? '(none)' : clip(value, 80);
}

function changed(label: string, a: string | number | null, b: string | number | null): string[] {
  if (a === b) return [];
  return [`${label} ${quote(String(a ?? '—'))} → ${quote(String(b ?? '—'))}`];
}

function textChanged(label: string, a: string, b: string): string[] {
  return a === b ? [] : [`${label} changed`];
}

/** "added X, Y; removed Z" for two lists of names (empty when equal as sets). */
function listChanges(label: string, a: readonly string[], b: readonly string[]): string[] {
  const added = b.filter((x) => !a.includes(x));
  const removed = a.filter((x) => !b.includes(x));
  const parts: string[] = [];
  if (added.length) parts.push(`added ${added.join(', ')}`);
  if (removed.length) parts.push(`removed ${removed.join(', ')}`);
  return parts.length ? [`${label}: ${parts.join('; ')}`] : [];
}

/** The unit's own fields (and, when given, its visibility and co-authors). */
export function unitFieldChanges(
  a: UnitFieldsSnapshot & { visibility?: string; coauthors?: string[] },
  b: UnitFieldsSnapshot & { visibility?: string; coauthors?: string[] },
): string[] {
  return [
    ...changed('title', a.title, b.title),
    ...changed('year level', a.yearLevel, b.yearLevel),
    ...changed('learning area', a.learningArea, b.learningArea),
    ...changed('term', a.term, b.term),
    ...textChanged('overview', a.overview, b.overview),
    ...listChanges('outcomes', a.outcomes, b.outcomes),
    ...changed('visibility', a.visibility ?? null, b.visibility ?? null),
    ...listChanges('co-authors', a.coauthors ?? [], b.coauthors ?? []),
  ];
}

const date = (local: string) => local.slice(0, 10);
const time = (local: string) => local.slice(11, 16);

/** "2026-07-21 11:10–12:00" */
export function lessonWhen(l: Pick<LessonSnapshot, 'startsAt' | 'endsAt'>): string {
  return `${date(l.startsAt)} ${time(l.startsAt)}–${time(l.endsAt)}`;
}

export interface LessonChangeOptions {
  /**
   * Whether to leave out the lesson's own arrangements (class, booked tubs, relief teacher): a
   * copy has its own, so the original's are no news to it.
   */
  contentOnly?: boolean;
}

/** The lesson's own fields (not its activities). */
export function lessonFieldChanges(
  a: LessonSnapshot,
  b: LessonSnapshot,
  options: LessonChangeOptions = {},
): string[] {
  const out = [
    ...changed('title', a.title, b.title),
    ...(lessonWhen(a) === lessonWhen(b) ? [] : [`time ${lessonWhen(a)} → ${lessonWhen(b)}`]),
    ...changed('kit type', a.kitTypeName, b.kitTypeName),
    ...changed('group size', a.groupSize, b.groupSize),
    ...changed('room', a.room, b.room),
    ...textChanged('learning intention', a.learningIntention, b.learningIntention),
    ...textChanged('success criteria', a.successCriteria, b.successCriteria),
    ...textChanged('relief notes', a.reliefNotes, b.reliefNotes),
  ];
  if (!options.contentOnly) {
    out.push(
      ...changed('class', a.className, b.className),
      ...listChanges('booked tubs', a.tubs, b.tubs),
      ...changed('relief teacher', a.reliefTeacher ?? '(none)', b.reliefTeacher ?? '(none)'),
    );
  }
  return out;
}

function materialKey(m: MaterialSnapshot): string {
  return m.partCode !== null ? `part ${m.partCode}` : `consumable ${m.consumable ?? ''}`;
}

function materialWords(m: MaterialSnapshot): string {
  return `${m.name} ×${m.qty} per ${m.per}`;
}

/** A bill of materials, line by line (a part or consumable listed twice counts its lines in order). */
export function materialChanges(a: MaterialSnapshot[], b: MaterialSnapshot[]): string[] {
  const keyed = (list: MaterialSnapshot[]) => {
    const seen = new Map<string, number>();
    return new Map(
      list.map((m) => {
        const base = materialKey(m);
        const n = (seen.get(base) ?? 0) + 1;
        seen.set(base, n);
        return [`${base} #${n}`, m] as const;
      }),
    );
  };
  const before = keyed(a);
  const after = keyed(b);
  const out: string[] = [];
  for (const [key, m] of after) {
    const old = before.get(key);
    if (!old) out.push(`added ${materialWords(m)}`);
    else if (old.qty !== m.qty || old.per !== m.per)
      out.push(`${m.name} ${old.qty} per ${old.per} → ${m.qty} per ${m.per}`);
    else if (old.returnable !== m.returnable)
      out.push(`${m.name} ${m.returnable ? 'now comes back' : 'no longer comes back'}`);
  }
  for (const [key, m] of before) if (!after.has(key)) out.push(`removed ${materialWords(m)}`);
  return out;
}

/** One activity's fields, materials and attachments. */
export function activityChanges(a: ActivitySnapshot, b: ActivitySnapshot): string[] {
  return [
    ...changed('title', a.title, b.title),
    ...changed('kind', a.kind, b.kind),
    ...changed('minutes', a.minutes, b.minutes),
    ...materialChanges(a.materials, b.materials),
    ...listChanges('attachments', a.attachments, b.attachments),
  ];
}

/** Whether the common members of two id lists come in a different order. */
function reordered(a: readonly { id: string }[], b: readonly { id: string }[]): boolean {
  const inB = new Set(b.map((x) => x.id));
  const inA = new Set(a.map((x) => x.id));
  const keptA = a.filter((x) => inB.has(x.id)).map((x) => x.id);
  const keptB = b.filter((x) => inA.has(x.id)).map((x) => x.id);
  return keptA.some((id, i) => keptB[i] !== id);
}

/** The lesson's activities: added, removed, changed, reordered; each line names the activity. */
export function lessonActivityChanges(a: LessonSnapshot, b: LessonSnapshot): string[] {
  const out: string[] = [];
  const before = new Map(a.activities.map((x) => [x.id, x]));
  const after = new Map(b.activities.map((x) => [x.id, x]));
  for (const act of b.activities) {
    const old = before.get(act.id);
    if (!old) out.push(`added activity ${act.title}`);
    else {
      const words = activityChanges(old, act);
      if (words.length) out.push(`${act.title}: ${words.join('; ')}`);
    }
  }
  for (const act of a.activities) if (!after.has(act.id)) out.push(`removed activity ${act.title}`);
  if (reordered(a.activities, b.activities)) out.push('activities reordered');
  return out;
}

/**
 * Everything that changed between two snapshots of a unit, one line each: its fields, lessons
 * added or removed, and each lesson's fields, times, activities and materials.
 */
export function unitChanges(
  a: UnitSnapshot,
  b: UnitSnapshot,
  options: LessonChangeOptions = {},
): string[] {
  const out = unitFieldChanges(a, b);
  const before = new Map(a.lessons.map((l) => [l.id, l]));
  const after = new Map(b.lessons.map((l) => [l.id, l]));
  for (const lesson of b.lessons) {
    const old = before.get(lesson.id);
    if (!old) {
      out.push(`added lesson ${lesson.title} (${lessonWhen(lesson)})`);
      continue;
    }
    const words = [
      ...lessonFieldChanges(old, lesson, options),
      ...lessonActivityChanges(old, lesson),
    ];
    if (words.length) out.push(`${lesson.title}: ${words.join('; ')}`);
  }
  for (const lesson of a.lessons)
    if (!after.has(lesson.id)) out.push(`removed lesson ${lesson.title}`);
  if (reordered(a.lessons, b.lessons)) out.push('lessons reordered');
  return out.map((line) => clip(line));
}
