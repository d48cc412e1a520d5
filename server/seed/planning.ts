/**
 * The planning part of the invented demo school (BRIEF.md, "Demo scenario"): Kestrel Ridge's
 * calendar for 2026, its classes, kit types and tubs, outcomes framework and three units; and one
 * kit type and one class at Banksia Flat, so that isolation between schools has something to
 * hide. Everything is invented, for the demo only, and fixed: the same seed gives the same data.
 */
import type { Tx } from '../db/client.js';
import { classes, classTeachers } from '../db/schema/index.js';
import type { SeedStep } from './demo.js';
import { seedCalendar } from './planning-calendar.js';
import { SEEDED_AT, seedBanksiaKit, seedKits } from './planning-kits.js';
import { seedOutcomes } from './planning-outcomes.js';
import {
  RESCUE_ROVERS,
  RESCUE_ROVERS_4M,
  RESCUE_ROVERS_4M_LESSONS,
  RESCUE_ROVERS_LESSONS,
} from './planning-rovers.js';
import { SMART_GATES, SMART_GATES_LESSONS } from './planning-gates.js';
import { insertUnit } from './planning-units.js';
import { seedCopy } from './planning-copy.js';

const TEACHER = 'teacher@kestrel-ridge.example';
const PARTNER = 'partner@kestrel-ridge.example';
const RELIEF = 'relief@kestrel-ridge.example';
const ADMIN = 'admin@kestrel-ridge.example';

/** The demo classes: name, year level, students, devices (tablets), teacher. */
const KESTREL_CLASSES = [
  { name: '4K', yearLevel: 4, studentCount: 27, devices: 8, teacher: TEACHER },
  { name: '4M', yearLevel: 4, studentCount: 25, devices: 7, teacher: PARTNER },
  { name: '6T', yearLevel: 6, studentCount: 29, devices: 10, teacher: TEACHER },
] as const;

async function seedClasses(
  tx: Tx,
  schoolId: string,
  userIds: Record<string, string>,
): Promise<Record<string, string>> {
  const rows = await tx
    .insert(classes)
    .values(
      KESTREL_CLASSES.map(({ teacher: _t, ...c }) => ({ schoolId, createdAt: SEEDED_AT, ...c })),
    )
    .returning({ id: classes.id, name: classes.name });
  const ids = Object.fromEntries(rows.map((r) => [r.name, r.id]));
  await tx
    .insert(classTeachers)
    .values(KESTREL_CLASSES.map((c) => ({ classId: ids[c.name]!, userId: userIds[c.teacher]! })));
  return ids;
}

/** Seeds the planning data; runs inside the demo seed's transaction. */
export const seedPlanning: SeedStep = async (tx, { kestrelId, banksiaId, userIds }) => {
  const periods = await seedCalendar(tx, kestrelId);
  const classIds = await seedClasses(tx, kestrelId, userIds);
  const kits = await seedKits(tx, kestrelId, userIds[ADMIN]!);
  const outcomeIds = await seedOutcomes(tx, kestrelId);
  const common = { schoolId: kestrelId, outcomeIds, reliefTeacherId: userIds[RELIEF]! };

  const rescueRoversId = await insertUnit(
    tx,
    {
      ...common,
      ownerId: userIds[TEACHER]!,
      classId: classIds['4K']!,
      kitTypeId: kits.roverKitId,
      tubIds: kits.roverTubIds,
      period: periods['Period 3'],
      room: 'Room 12',
      copiedFromId: null,
      createdAt: SEEDED_AT,
    },
    RESCUE_ROVERS,
    RESCUE_ROVERS_LESSONS,
  );
  await insertUnit(
    tx,
    {
      ...common,
      ownerId: userIds[TEACHER]!,
      classId: classIds['6T']!,
      kitTypeId: kits.gateKitId,
      tubIds: kits.gateTubIds,
      period: periods['Period 4'],
      room: 'Science and technology room',
      copiedFromId: null,
      createdAt: SEEDED_AT,
    },
    SMART_GATES,
    SMART_GATES_LESSONS,
  );
  // The teaching partner's copy, a real one with its provenance, shared with the school.
  await seedCopy(tx, {
    sourceUnitId: rescueRoversId,
    schoolId: kestrelId,
    ownerId: userIds[PARTNER]!,
    classId: classIds['4M']!,
    period: periods['Period 5'],
    room: 'Room 14',
    startDate: RESCUE_ROVERS_4M_LESSONS[0]!.date,
    at: new Date('2026-07-15T15:45:00+09:30'),
    unit: RESCUE_ROVERS_4M,
    lessonSeeds: RESCUE_ROVERS_4M_LESSONS,
  });

  await seedBanksiaKit(tx, banksiaId);
  await tx.insert(classes).values({
    schoolId: banksiaId,
    name: 'Room 3',
    yearLevel: 3,
    studentCount: 22,
    devices: 6,
    createdAt: SEEDED_AT,
  });
};
