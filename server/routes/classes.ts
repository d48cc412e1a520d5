/**
 * Classes under /api/classes. Admins and teachers keep them; leads read them too (coverage by
 * year level); relief teachers meet a class through the lesson pack, not here.
 */
import { Router } from 'express';
import { and, asc, eq, inArray, ne, sql } from 'drizzle-orm';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { classes, classTeachers, users } from '../db/schema/index.js';
import { HttpError, forbidden, notFound, parse, parseParams } from '../http.js';
import { isUniqueViolation } from '../db/errors.js';
import { authorize, canEditClass, type Actor } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import {
  classCreateSchema,
  classUpdateSchema,
  type SchoolClass,
} from '../../shared/schemas/classes.js';

const nameTaken = () =>
  new HttpError(409, 'name-taken', 'Another class of the school already has this name.', [
    { path: 'name', message: 'Another class already has this name.' },
  ]);

/** The school's classes (or one), by year level and name, with teachers and lesson counts. */
async function listClasses(tx: Tx, schoolId: string, onlyId?: string): Promise<SchoolClass[]> {
  const where = onlyId
    ? and(eq(classes.schoolId, schoolId), eq(classes.id, onlyId))
    : eq(classes.schoolId, schoolId);
  const rows = await tx
    .select({
      id: classes.id,
      name: classes.name,
      yearLevel: classes.yearLevel,
      studentCount: classes.studentCount,
      devices: classes.devices,
      // Written out: drizzle leaves columns unqualified in a one-table select (a subquery
      // would misread them).
      lessonCount: sql<number>`(SELECT count(*)::int FROM lessons l WHERE l.class_id = classes.id)`,
    })
    .from(classes)
    .where(where)
    .orderBy(asc(classes.yearLevel), asc(classes.name));
  if (!rows.length) return [];
  const teachers = await tx
    .select({ classId: classTeachers.classId, id: users.id, name: users.name, email: users.email })
    .from(classTeachers)
    .innerJoin(users, eq(users.id, classTeachers.userId))
    .where(
      inArray(
        classTeachers.classId,
        rows.map((r) => r.id),
      ),
    )
    .orderBy(asc(users.name), asc(users.email));
  return rows.map((r) => ({
    ...r,
    teachers: teachers
      .filter((t) => t.classId === r.id)
      .map(({ id, name, email }) => ({ id, name, email })),
  }));
}

async function oneClass(tx: Tx, actor: Actor, id: string): Promise<SchoolClass> {
  const [found] = await listClasses(tx, actor.schoolId, id);
  if (!found) throw notFound('That class');
  return found;
}

/** The class if the actor may change it: 404 for another school's, 403 for a colleague's. */
async function editableClass(tx: Tx, actor: Actor, id: string): Promise<SchoolClass> {
  const found = await oneClass(tx, actor, id);
  if (
    !canEditClass(
      actor,
      found.teachers.map((t) => t.id),
    )
  )
    throw forbidden('Only the teachers of this class and admins change it.');
  return found;
}

/** 400 unless every id is a teacher of the actor's school (another school's id reads the same). */
async function checkTeachers(tx: Tx, actor: Actor, ids: string[]): Promise<void> {
  if (!ids.length) return;
  const rows = await tx
    .select({ id: users.id })
    .from(users)
    .where(
      and(
        eq(users.schoolId, actor.schoolId),
        eq(users.role, 'teacher'),
        ne(users.status, 'deactivated'),
        inArray(users.id, ids),
      ),
    );
  const known = new Set(rows.map((r) => r.id));
  const details = ids.flatMap((id, i) =>
    known.has(id) ? [] : [{ path: `teacherIds.${i}`, message: 'Pick a teacher of this school.' }],
  );
  if (details.length)
    throw new HttpError(400, 'invalid-input', 'Some fields need attention.', details);
}

/** 409 when another class of the school has the name, whatever its capitals. */
async function checkName(tx: Tx, schoolId: string, name: string, exceptId?: string): Promise<void> {
  const [clash] = await tx
    .select({ id: classes.id })
    .from(classes)
    .where(
      and(
        eq(classes.schoolId, schoolId),
        sql`lower(${classes.name}) = lower(${name})`,
        exceptId ? ne(classes.id, exceptId) : undefined,
      ),
    );
  if (clash) throw nameTaken();
}

async function setTeachers(tx: Tx, classId: string, ids: string[]): Promise<void> {
  await tx.delete(classTeachers).where(eq(classTeachers.classId, classId));
  if (ids.length) await tx.insert(classTeachers).values(ids.map((userId) => ({ classId, userId })));
}

/** List, read, create, change and delete classes under /api/classes. */
export function classesRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'classes.read');
    res.json({ classes: await listClasses(ctx.db, actor.schoolId) });
  });

  router.get('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'classes.read');
    const { id } = parseParams(idParamsSchema, req);
    res.json({ class: await oneClass(ctx.db, actor, id) });
  });

  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'classes.edit');
    const body = parse(classCreateSchema, req.body);
    // A teacher who adds a class without naming its teachers teaches it.
    const teacherIds = body.teacherIds ?? (actor.role === 'teacher' ? [actor.id] : []);
    try {
      const created = await ctx.db.transaction(async (tx) => {
        await checkTeachers(tx, actor, teacherIds);
        await checkName(tx, actor.schoolId, body.name);
        const [row] = await tx
          .insert(classes)
          .values({
            schoolId: actor.schoolId,
            name: body.name,
            yearLevel: body.yearLevel,
            studentCount: body.studentCount,
            devices: body.devices,
          })
          .returning({ id: classes.id });
        await setTeachers(tx, row!.id, teacherIds);
        return oneClass(tx, actor, row!.id);
      });
      res.status(201).json({ class: created });
    } catch (err) {
      throw isUniqueViolation(err) ? nameTaken() : err;
    }
  });

  router.patch('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'classes.edit');
    const { id } = parseParams(idParamsSchema, req);
    const body = parse(classUpdateSchema, req.body);
    try {
      const updated = await ctx.db.transaction(async (tx) => {
        await editableClass(tx, actor, id);
        if (body.teacherIds) await checkTeachers(tx, actor, body.teacherIds);
        if (body.name !== undefined) await checkName(tx, actor.schoolId, body.name, id);
        const { teacherIds, ...fields } = body;
        if (Object.values(fields).some((v) => v !== undefined)) {
          await tx
            .update(classes)
            .set(fields)
            .where(and(eq(classes.id, id), eq(classes.schoolId, actor.schoolId)));
        }
        if (teacherIds) await setTeachers(tx, id, teacherIds);
        return oneClass(tx, actor, id);
      });
      res.json({ class: updated });
    } catch (err) {
      throw isUniqueViolation(err) ? nameTaken() : err;
    }
  });

  router.delete('/:id', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'classes.edit');
    const { id } = parseParams(idParamsSchema, req);
    await ctx.db.transaction(async (tx) => {
      // Lock the class so a lesson cannot be added for it between the count and the delete.
      await tx.execute(
        sql`SELECT id FROM classes WHERE id = ${id} AND school_id = ${actor.schoolId} FOR UPDATE`,
      );
      const found = await editableClass(tx, actor, id);
      if (found.lessonCount > 0) {
        const n = found.lessonCount;
        const [lessonWord, them] = n === 1 ? ['lesson', 'it'] : ['lessons', 'them'];
        throw new HttpError(
          409,
          'in-use',
          `${found.name} is used by ${n} ${lessonWord}. ` +
            `Move ${them} to another class or delete ${them} first.`,
        );
      }
      await tx.delete(classes).where(eq(classes.id, id));
    });
    res.status(204).end();
  });

  return router;
}
