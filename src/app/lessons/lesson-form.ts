import { FormControl, type AbstractControl, type ValidationErrors } from '@angular/forms';
import { uuidSchema } from '../../../shared/schemas/common';
import {
  groupSizeSchema,
  lessonWindowProblem,
  localMinutes,
  type Lesson,
  type LessonCreate,
} from '../../../shared/schemas/lessons';
import { markdownText, plainText, requiredText } from '../../../shared/schemas/units';
import { zodValidator } from '../forms/validators';

const DATE = /^\d{4}-\d{2}-\d{2}$/;
const CLOCK = /^([01]\d|2[0-3]):[0-5]\d$/;

function dateValidator(control: AbstractControl): ValidationErrors | null {
  const value = String(control.value ?? '');
  if (!value) return { empty: 'Enter the date of the lesson.' };
  return DATE.test(value) && localMinutes(`${value}T00:00`) !== null
    ? null
    : { invalid: 'Enter a date like 2026-07-28.' };
}

function clockValidator(what: string) {
  return (control: AbstractControl): ValidationErrors | null => {
    const value = String(control.value ?? '');
    if (!value) return { empty: `Enter the time the lesson ${what}.` };
    return CLOCK.test(value) ? null : { invalid: 'Enter a time like 11:10.' };
  };
}

/** The end time also checks the whole window (after the start, at most 480 minutes). */
function endValidator(control: AbstractControl): ValidationErrors | null {
  const own = clockValidator('ends')(control);
  if (own) return own;
  const date = String(control.parent?.get('date')?.value ?? '');
  const start = String(control.parent?.get('startTime')?.value ?? '');
  if (!DATE.test(date) || !CLOCK.test(start)) return null;
  const problem = lessonWindowProblem(`${date}T${start}`, `${date}T${String(control.value)}`);
  return problem ? { window: problem } : null;
}

/** The lesson form's controls; each validates as `lessonCreateSchema` does, in its words. */
export function lessonControls() {
  return {
    title: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(requiredText('a title', 200))],
    }),
    classId: new FormControl<string | null>(null, {
      validators: [zodValidator(uuidSchema, 'Choose a class.')],
    }),
    kitTypeId: new FormControl<string | null>(null, {
      validators: [zodValidator(uuidSchema, 'Choose a kit type.')],
    }),
    tubIds: new FormControl<string[]>([], { nonNullable: true }),
    date: new FormControl('', { nonNullable: true, validators: [dateValidator] }),
    periodId: new FormControl<string | null>(null),
    startTime: new FormControl('', { nonNullable: true, validators: [clockValidator('starts')] }),
    endTime: new FormControl('', { nonNullable: true, validators: [endValidator] }),
    groupSize: new FormControl<number | null>(3, {
      validators: [zodValidator(groupSizeSchema, 'Enter a group size.')],
    }),
    room: new FormControl('', { nonNullable: true, validators: [zodValidator(plainText(100))] }),
    learningIntention: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(markdownText(5000))],
    }),
    successCriteria: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(markdownText(5000))],
    }),
    reliefNotes: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(markdownText(10_000))],
    }),
    reliefTeacherId: new FormControl<string | null>(null),
  };
}

/** What the form's raw value looks like. */
export interface LessonFormValue {
  title: string;
  classId: string | null;
  kitTypeId: string | null;
  tubIds: string[];
  date: string;
  periodId: string | null;
  startTime: string;
  endTime: string;
  groupSize: number | null;
  room: string;
  learningIntention: string;
  successCriteria: string;
  reliefNotes: string;
  reliefTeacherId: string | null;
}

/** The form's value for a stored lesson (`startsAt` is `2026-07-28T11:10`, school time). */
export function formValueOf(lesson: Lesson): LessonFormValue {
  return {
    title: lesson.title,
    classId: lesson.class.id,
    kitTypeId: lesson.kitType.id,
    tubIds: [...lesson.tubIds],
    date: lesson.startsAt.slice(0, 10),
    periodId: lesson.periodId,
    startTime: lesson.startsAt.slice(11, 16),
    endTime: lesson.endsAt.slice(11, 16),
    groupSize: lesson.groupSize,
    room: lesson.room,
    learningIntention: lesson.learningIntention,
    successCriteria: lesson.successCriteria,
    reliefNotes: lesson.reliefNotes,
    reliefTeacherId: lesson.reliefTeacherId,
  };
}

/** The body of `POST /api/units/:id/lessons` (and what a PATCH is compared against). */
export function lessonBody(v: LessonFormValue): Required<LessonCreate> {
  return {
    title: v.title.trim(),
    classId: v.classId ?? '',
    kitTypeId: v.kitTypeId ?? '',
    tubIds: [...v.tubIds],
    startsAt: `${v.date}T${v.startTime}`,
    endsAt: `${v.date}T${v.endTime}`,
    periodId: v.periodId,
    groupSize: v.groupSize ?? 0,
    room: v.room.trim(),
    learningIntention: v.learningIntention,
    successCriteria: v.successCriteria,
    reliefNotes: v.reliefNotes,
    reliefTeacherId: v.reliefTeacherId,
  };
}

type Body = ReturnType<typeof lessonBody>;

/** Names of the lesson's fields, for "what changed". */
export const FIELD_LABELS: Record<keyof Body, string> = {
  title: 'title',
  classId: 'class',
  kitTypeId: 'kit type',
  tubIds: 'tubs booked',
  startsAt: 'start',
  endsAt: 'end',
  periodId: 'period',
  groupSize: 'group size',
  room: 'room',
  learningIntention: 'learning intention',
  successCriteria: 'success criteria',
  reliefNotes: 'relief notes',
  reliefTeacherId: 'relief teacher',
};

function same(a: unknown, b: unknown): boolean {
  if (Array.isArray(a) && Array.isArray(b)) {
    return a.length === b.length && [...a].sort().join() === [...b].sort().join();
  }
  return a === b;
}

/** The fields of `next` that differ from `lesson` as stored (the body of a PATCH, less version). */
export function changedFields(lesson: Lesson, next: Body): Partial<Body> {
  const before = lessonBody(formValueOf(lesson));
  const change: Partial<Body> = {};
  for (const key of Object.keys(next) as (keyof Body)[]) {
    if (!same(before[key], next[key])) (change as Record<string, unknown>)[key] = next[key];
  }
  return change;
}

/** Where a server detail's path goes in this form. */
export const SERVER_PATHS: Readonly<Record<string, string>> = {
  startsAt: 'startTime',
  endsAt: 'endTime',
};
