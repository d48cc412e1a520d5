import {
  computePrepPlan,
  groupControllers,
  planPartCodes,
  type LessonPrep,
  type PrepInput,
  type PrepPlan,
} from '../../../shared/prep/index';
import type { Part } from '../../../shared/schemas/kits';
import type { Lesson } from '../../../shared/schemas/lessons';

/**
 * Test data for the lesson specs: the worked example of PREP-RULES.md ("Worked example") fed
 * through the real engine, so the screen is checked against the plan the rules define rather
 * than against a hand-written answer. The lesson record around it is invented demo data.
 */
export function workedExampleInput(overrides: Partial<PrepInput> = {}): PrepInput {
  const part = (code: string, name: string, extra: Partial<PrepInput['parts'][number]>) => ({
    code,
    name,
    category: 'beam',
    small: false,
    fullChargeMinutes: null,
    ...extra,
  });
  const tub = (label: string, stock: Record<string, number>) => ({
    id: `id-${label}`,
    label,
    status: 'ready' as const,
    stock,
  });
  return {
    timezone: 'Australia/Adelaide',
    lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 3 },
    class: { studentCount: 10, devices: 2 },
    parts: [
      part('RB-001', 'Controller', { category: 'controller', fullChargeMinutes: 180 }),
      part('RB-010', 'Motor', { category: 'motor' }),
      part('RB-020', 'Pin', { category: 'connector', small: true }),
    ],
    tubs: [
      tub('Tub 1', { 'RB-001': 1, 'RB-010': 2, 'RB-020': 20 }),
      tub('Tub 2', { 'RB-001': 1, 'RB-010': 1, 'RB-020': 20 }),
      tub('Tub 3', { 'RB-001': 1, 'RB-010': 2, 'RB-020': 6 }),
    ],
    activities: [
      {
        title: 'Build the rover',
        kind: 'build',
        minutes: 25,
        materials: [
          { partCode: 'RB-001', qty: 1, per: 'group' },
          { partCode: 'RB-010', qty: 2, per: 'group' },
          { partCode: 'RB-020', qty: 4, per: 'student' },
        ],
      },
      {
        title: 'Code the rover',
        kind: 'code',
        minutes: 15,
        materials: [
          { partCode: 'RB-001', qty: 1, per: 'group' },
          { partCode: 'RB-020', qty: 2, per: 'group' },
        ],
      },
    ],
    ...overrides,
  } as PrepInput;
}

export function workedExamplePlan(overrides: Partial<PrepInput> = {}): PrepPlan {
  return computePrepPlan(workedExampleInput(overrides));
}

/**
 * A plan as `GET /api/lessons/:id/prep` answers it: with the name, colour and compartment of each
 * part it mentions, taken from `workedExampleParts` as the server takes them from the parts list.
 */
export function workedExamplePrep(
  plan: PrepPlan,
  input: PrepInput = workedExampleInput(),
): LessonPrep {
  const byCode = new Map(workedExampleParts().map((p) => [p.code, p]));
  const partNames: LessonPrep['partNames'] = {};
  const parts: LessonPrep['parts'] = {};
  for (const code of planPartCodes(plan)) {
    const part = byCode.get(code);
    partNames[code] = part?.name ?? code;
    parts[code] = {
      name: part?.name ?? code,
      colour: part?.colour ?? null,
      compartment: part?.compartment ?? null,
    };
  }
  return { ...plan, partNames, parts, controllers: groupControllers(plan, input), ticks: [] };
}

/** The parts list of the worked example's kit type (colours and compartments invented). */
export function workedExampleParts(): Part[] {
  const base = { qty: 1, small: false, chargeMinutes: null, hasPhoto: false };
  return [
    {
      ...base,
      id: 'p1',
      code: 'RB-001',
      name: 'Controller',
      colour: 'Grey',
      category: 'controller',
      compartment: 'A',
      chargeMinutes: 180,
    },
    {
      ...base,
      id: 'p2',
      code: 'RB-010',
      name: 'Motor',
      colour: 'Black',
      category: 'motor',
      compartment: 'B',
    },
    {
      ...base,
      id: 'p3',
      code: 'RB-020',
      name: 'Pin',
      colour: 'Blue',
      category: 'connector',
      compartment: 'C',
      small: true,
    },
  ] as Part[];
}

/** An invented lesson record around the worked example. */
export function workedExampleLesson(overrides: Partial<Lesson> = {}): Lesson {
  return {
    id: 'lesson-2',
    version: 3,
    position: 2,
    title: 'Drive train',
    unit: { id: 'unit-rovers', title: 'Rescue Rovers', status: 'draft' },
    class: { id: 'class-4k', name: '4K', yearLevel: 4, studentCount: 10, devices: 2 },
    kitType: { id: 'kit-rover', name: 'Rover Builder Tub' },
    tubIds: ['t1', 't2', 't3'],
    tubs: [
      { id: 't1', label: 'Tub 1', status: 'ready' },
      { id: 't2', label: 'Tub 2', status: 'ready' },
      { id: 't3', label: 'Tub 3', status: 'ready' },
    ],
    startsAt: '2026-07-28T11:10',
    endsAt: '2026-07-28T12:00',
    periodId: null,
    room: '',
    groupSize: 3,
    learningIntention: '',
    successCriteria: '',
    reliefNotes: '',
    reliefTeacherId: null,
    canEdit: true,
    activities: [],
    updatedAt: '2026-07-20T09:00:00+09:30',
    bookingConflicts: [],
    ...overrides,
  };
}
