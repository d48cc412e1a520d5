import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import * as z from 'zod';
import { prepTaskSchema } from '../../../shared/prep/plan-schema';
import { parseWith } from '../errors/parse';

/**
 * `GET /api/agenda` as server/routes/agenda.ts answers it. No shared schema exists for it yet,
 * so it is written here from the router's code.
 */
const agendaLessonSchema = z.object({
  id: z.string(),
  title: z.string(),
  unitId: z.string(),
  unitTitle: z.string(),
  className: z.string(),
  startsAt: z.string(),
  endsAt: z.string(),
});

export const agendaSchema = z.object({
  week: z.string(),
  lessons: z.array(
    agendaLessonSchema.extend({ groups: z.number().nullable(), shortfalls: z.number() }),
  ),
  tasks: z.array(
    prepTaskSchema.extend({
      lesson: agendaLessonSchema,
      /** Ticked done by one of the lesson's teachers (on the lesson page), or null. */
      tick: z
        .object({ at: z.string(), by: z.object({ id: z.string(), name: z.string() }).nullable() })
        .nullable(),
    }),
  ),
  attention: z.array(
    z.object({ lesson: agendaLessonSchema, kind: z.string(), message: z.string() }),
  ),
  /** Mondays of the nearest weeks before and after this one that hold lessons of the list. */
  otherWeeks: z.object({ previous: z.string().nullable(), next: z.string().nullable() }),
});
export type Agenda = z.infer<typeof agendaSchema>;

/** The signed-in person's week of lessons, prep tasks and things needing action. */
@Injectable({ providedIn: 'root' })
export class AgendaApi {
  private readonly http = inject(HttpClient);

  week(monday: string): Observable<Agenda> {
    const params = new HttpParams().set('week', monday).set('mine', 'true');
    return this.http.get('/api/agenda', { params }).pipe(parseWith(agendaSchema));
  }
}

/** The Monday (`YYYY-MM-DD`) of the week holding `date`, on the calendar (no timezone). */
export function mondayOf(date: string): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  const t = new Date(Date.UTC(y, m - 1, d));
  const back = (t.getUTCDay() + 6) % 7; // ISO weeks start on Monday
  return addDays(date, -back);
}

/** `date` plus `days` calendar days. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** Today's date on the browser's calendar as `YYYY-MM-DD`. */
export function today(now: Date = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}
