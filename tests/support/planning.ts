/**
 * Set-up shared by the planning tests: records written straight to the database (a teacher of
 * either demo school, kit types with their parts lists, tubs, classes, units and lessons),
 * browsers signed in once per e-mail, and whole-file downloads. The records are invented test
 * data; only the demo accounts and the two demo schools come from the seed.
 */
import { eq } from 'drizzle-orm';
import type { Express } from 'express';
import type { Db } from '../../server/db/client.js';
import {
  classes,
  kitTypes,
  lessons,
  lessonTubs,
  parts,
  schools,
  tubs,
  units,
  users,
} from '../../server/db/schema/index.js';
import { hashPassword } from '../../server/auth/passwords.js';
import { DEMO_PASSWORD } from '../../server/seed/index.js';
import { signedIn, type Browser } from './app.js';

/** Demo accounts of Kestrel Ridge (password DEMO_PASSWORD), one per role. */
export const ADMIN = 'admin@kestrel-ridge.example';
export const LEAD = 'lead@kestrel-ridge.example';
export const TEACHER = 'teacher@kestrel-ridge.example';
export const PARTNER = 'partner@kestrel-ridge.example';
export const RELIEF = 'relief@kestrel-ridge.example';
/** The demo admin of the other school, for isolation checks. */
export const OTHER_ADMIN = 'admin@banksia-flat.example';
/**
 * Not a demo account: a teacher of the other school that a test file adds for itself with
 * `addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER)` (the demo seed has only its admin there).
 */
export const OTHER_TEACHER = 'teacher@banksia-flat.example';

/** The demo seed's two schools, by name. */
export const KESTREL_RIDGE = 'Kestrel Ridge Primary School';
export const BANKSIA_FLAT = 'Banksia Flat School';

async function schoolIdByName(db: Db, name: string): Promise<string> {
  const [row] = await db.select().from(schools).where(eq(schools.name, name));
  if (!row) throw new Error(`No school named ${name} in the test database.`);
  return row.id;
}

/** The ids of the two demo schools: Kestrel Ridge (most tests) and Banksia Flat (isolation). */
export async function schoolIds(db: Db): Promise<{ kestrel: string; banksia: string }> {
  return {
    kestrel: await schoolIdByName(db, KESTREL_RIDGE),
    banksia: await schoolIdByName(db, BANKSIA_FLAT),
  };
}

/**
 * Adds an active teacher to the named school, with the demo password so `signedIn` works for
 * them too (the demo seed has only an admin at Banksia Flat). Returns the new user's id.
 */
export async function addTeacher(
  db: Db,
  schoolName: string,
  email: string,
  name = 'Other Teacher',
): Promise<string> {
  const [row] = await db
    .insert(users)
    .values({
      schoolId: await schoolIdByName(db, schoolName),
      email,
      name,
      role: 'teacher',
      status: 'active',
      passwordHash: await hashPassword(DEMO_PASSWORD),
    })
    .returning();
  return row!.id;
}

/** Every user's id by e-mail, as the database holds them now. */
export async function userIds(db: Db): Promise<Record<string, string>> {
  const ids: Record<string, string> = {};
  for (const u of await db.select().from(users)) ids[u.email] = u.id;
  return ids;
}

/** The user with this e-mail (a demo account or one added by `addTeacher`). */
export async function userByEmail(db: Db, email: string): Promise<typeof users.$inferSelect> {
  const [row] = await db.select().from(users).where(eq(users.email, email));
  if (!row) throw new Error(`No user ${email} in the test database.`);
  return row;
}

/** A line of a parts list as `insertKit` takes it: its kit type and position are filled in. */
export type PartLine = Omit<typeof parts.$inferInsert, 'kitTypeId' | 'position'>;

/**
 * Inserts a kit type and its parts list, in the order given. Positions count from
 * `firstPosition` (1 unless given). Returns the kit type's id.
 */
export async function insertKit(
  db: Db,
  schoolId: string,
  kit: { name: string; parts?: PartLine[]; firstPosition?: number },
): Promise<string> {
  const [row] = await db.insert(kitTypes).values({ schoolId, name: kit.name }).returning();
  const list = kit.parts ?? [];
  const first = kit.firstPosition ?? 1;
  if (list.length)
    await db
      .insert(parts)
      .values(list.map((p, i) => ({ ...p, kitTypeId: row!.id, position: first + i })));
  return row!.id;
}

/** A tub as `insertTubs` takes it: a label alone, or a label with other columns (e.g. status). */
export type TubLine = string | Omit<typeof tubs.$inferInsert, 'schoolId' | 'kitTypeId'>;

/** Inserts tubs of one kit type in one statement, in the order given; returns their ids by label. */
export async function insertTubs(
  db: Db,
  schoolId: string,
  kitTypeId: string,
  list: TubLine[],
): Promise<Record<string, string>> {
  const rows = await db
    .insert(tubs)
    .values(
      list.map((tub) => ({
        ...(typeof tub === 'string' ? { label: tub } : tub),
        schoolId,
        kitTypeId,
      })),
    )
    .returning();
  return Object.fromEntries(rows.map((r) => [r.label, r.id]));
}

/** Inserts a class; returns its id. */
export async function insertClass(
  db: Db,
  schoolId: string,
  values: Omit<typeof classes.$inferInsert, 'schoolId'>,
): Promise<string> {
  const [row] = await db
    .insert(classes)
    .values({ ...values, schoolId })
    .returning();
  return row!.id;
}

/** Inserts a unit (private unless `visibility` says otherwise); returns its id. */
export async function insertUnit(db: Db, values: typeof units.$inferInsert): Promise<string> {
  const [row] = await db.insert(units).values(values).returning();
  return row!.id;
}

/**
 * Inserts a lesson (position 0 unless given) and books the tubs for it, for tests whose routes
 * are not the lesson routes. Returns the lesson's id.
 */
export async function insertLesson(
  db: Db,
  values: Omit<typeof lessons.$inferInsert, 'position'> & { position?: number },
  tubIds: string[] = [],
): Promise<string> {
  const [row] = await db
    .insert(lessons)
    .values({ ...values, position: values.position ?? 0 })
    .returning();
  if (tubIds.length)
    await db.insert(lessonTubs).values(tubIds.map((tubId) => ({ lessonId: row!.id, tubId })));
  return row!.id;
}

/**
 * A lesson written straight to the database in a new unit of the teacher's ('A test unit', with
 * the lesson's year level), for suites that only need some lesson to use a class, kit type or
 * tubs: 'A test lesson' in groups of 3, booking the tubs given. Returns the lesson's id.
 */
export async function insertTestLesson(
  db: Db,
  teacher: { id: string; schoolId: string },
  lesson: {
    classId: string;
    kitTypeId: string;
    yearLevel: number;
    startsAt: string;
    endsAt: string;
  },
  tubIds: string[] = [],
): Promise<string> {
  const { schoolId } = teacher;
  const unitId = await insertUnit(db, {
    schoolId,
    ownerId: teacher.id,
    title: 'A test unit',
    yearLevel: lesson.yearLevel,
  });
  return insertLesson(
    db,
    {
      unitId,
      schoolId,
      title: 'A test lesson',
      classId: lesson.classId,
      kitTypeId: lesson.kitTypeId,
      startsAt: lesson.startsAt,
      endsAt: lesson.endsAt,
      groupSize: 3,
    },
    tubIds,
  );
}

/** Gives the browser signed in as this e-mail, signing in on first use. */
export type SignIn = (email: string) => Promise<Browser>;

/**
 * Browsers for the app, signed in once per e-mail and reused after that (sign-in hashes a
 * password, so a file that signs in anew for every request is slow for nothing).
 */
export function browsers(app: Express): SignIn {
  const byEmail = new Map<string, Browser>();
  return async (email) => {
    if (!byEmail.has(email)) byEmail.set(email, await signedIn(app, email));
    return byEmail.get(email)!;
  };
}

/** Gets a URL and keeps the whole body as a Buffer, whatever its content type (PDFs, images). */
export async function download(b: Browser, url: string) {
  return b.agent
    .get(url)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });
}
