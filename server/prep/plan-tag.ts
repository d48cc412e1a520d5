/**
 * The entity tag of a lesson's plan (RFC 9110 §8.8.3): it changes whenever anything the plan is
 * computed from changes, so an unchanged plan can be answered 304 without loading or computing.
 *
 * Rather than a version column on every table (several have none, and a counter bumped by
 * triggers would serialise a school's writers on one row), the tag digests each row's id with
 * its `xmin`, the id of the transaction that wrote that row version (PostgreSQL documentation,
 * "System Columns"): any insert, update or delete of a row the plan reads changes the digest.
 * The set mirrors loadPrepInput and planLesson, with a day either side for the other lessons
 * that share a tub (conflicts, recharge gaps), and the engine's own code.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { sql } from 'drizzle-orm';
import type { Tx } from '../db/client.js';

const here = dirname(fileURLToPath(import.meta.url));

/**
 * A digest of the planning code itself (engine and loader), so a release that plans differently
 * never confirms a plan an older one sent. Instances of one release agree on it.
 */
const CODE_DIGEST = (() => {
  const hash = createHash('sha256');
  for (const dir of [join(here, '../../shared/prep'), here]) {
    for (const file of readdirSync(dir).sort()) {
      if (/\.(ts|js)$/.test(file)) hash.update(file).update(readFileSync(join(dir, file)));
    }
  }
  return hash.digest('hex').slice(0, 12);
})();

/** The plan's tag as a strong ETag value (quoted), or null when there is no such lesson. */
export async function planTag(tx: Tx, lessonId: string): Promise<string | null> {
  const result = await tx.execute<{ digest: string | null }>(sql`
    with l as (
      select id, school_id, class_id, kit_type_id, starts_at, ends_at
      from lessons where id = ${lessonId}
    ),
    booked as (select tub_id from lesson_tubs where lesson_id = ${lessonId}),
    near as (
      select o.id, o.class_id, o.xmin::text as x from lessons o, l
      where o.school_id = l.school_id and o.id <> l.id
        and o.starts_at < l.ends_at + interval '1 day'
        and o.ends_at > l.starts_at - interval '1 day'
        and exists (
          select 1 from lesson_tubs ot
          where ot.lesson_id = o.id and ot.tub_id in (select tub_id from booked)
        )
    ),
    rows(k) as (
      select 'lesson:' || id || ':' || xmin::text from lessons where id = ${lessonId}
      union all select 'class:' || c.id || ':' || c.xmin::text from classes c, l
        where c.id = l.class_id
      union all select 'school:' || s.id || ':' || s.xmin::text from schools s, l
        where s.id = l.school_id
      union all select 'settings:' || ss.xmin::text from school_settings ss, l
        where ss.school_id = l.school_id
      union all select 'kit:' || k.id || ':' || k.xmin::text from kit_types k, l
        where k.id = l.kit_type_id
      union all select 'part:' || p.id || ':' || p.xmin::text from parts p, l
        where p.kit_type_id = l.kit_type_id
      union all select 'booking:' || tub_id || ':' || xmin::text from lesson_tubs
        where lesson_id = ${lessonId}
      union all select 'tub:' || t.id || ':' || t.xmin::text from tubs t
        where t.id in (select tub_id from booked)
      union all select 'missing:' || m.tub_id || ':' || m.part_code || ':' || m.xmin::text
        from tub_missing m where m.tub_id in (select tub_id from booked)
      union all select 'activity:' || a.id || ':' || a.xmin::text from activities a
        where a.lesson_id = ${lessonId}
      union all select 'material:' || mt.id || ':' || mt.xmin::text from materials mt
        join activities a on a.id = mt.activity_id where a.lesson_id = ${lessonId}
      union all select 'tick:' || pt.task_key || ':' || pt.xmin::text from prep_task_ticks pt
        where pt.lesson_id = ${lessonId}
      union all select 'ticker:' || u.id || ':' || u.xmin::text from users u
        where u.id in (select ticked_by from prep_task_ticks where lesson_id = ${lessonId})
      union all select 'near:' || id || ':' || x from near
      union all select 'near-booking:' || ot.lesson_id || ':' || ot.tub_id || ':' || ot.xmin::text
        from lesson_tubs ot where ot.lesson_id in (select id from near)
      union all select 'near-class:' || c.id || ':' || c.xmin::text from classes c
        where c.id in (select class_id from near)
    )
    select case when exists (select 1 from l)
      then md5(string_agg(k, ',' order by k)) end as digest
    from rows
  `);
  const digest = result.rows[0]?.digest;
  return digest ? `"plan-${CODE_DIGEST}-${digest}"` : null;
}
