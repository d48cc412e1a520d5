/**
 * Builders for prep engine tests. The worked example is the one in PREP-RULES.md; everything
 * else here is invented test data (part codes, tub labels, lesson titles).
 */
import type { PrepInput } from '../../shared/prep/index.js';

type Part = PrepInput['parts'][number];
type Tub = PrepInput['tubs'][number];
type Activity = PrepInput['activities'][number];
type Material = Activity['materials'][number];

export function part(code: string, name: string, extra: Partial<Part> = {}): Part {
  return { code, name, category: 'beam', small: false, fullChargeMinutes: null, ...extra };
}

export function tub(label: string, stock: Record<string, number>, extra: Partial<Tub> = {}): Tub {
  return { id: `id-${label}`, label, status: 'ready', stock, ...extra };
}

export function activity(
  title: string,
  materials: Material[],
  extra: Partial<Activity> = {},
): Activity {
  return { title, kind: 'build', minutes: 10, materials, ...extra };
}

/** A plain lesson: 8 students in groups of 4 (2 groups), 11:10–12:00 in Adelaide. */
export function lesson(extra: Partial<PrepInput> = {}): PrepInput {
  return {
    timezone: 'Australia/Adelaide',
    lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize: 4 },
    class: { studentCount: 8, devices: 8 },
    parts: [part('X-1', 'Beam')],
    tubs: [tub('Tub 1', { 'X-1': 100 })],
    activities: [activity('Build', [{ partCode: 'X-1', qty: 1, per: 'group' }])],
    ...extra,
  };
}

/** The worked example of PREP-RULES.md, as written there. */
export function workedExample(): PrepInput {
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
      activity(
        'Build the rover',
        [
          { partCode: 'RB-001', qty: 1, per: 'group' },
          { partCode: 'RB-010', qty: 2, per: 'group' },
          { partCode: 'RB-020', qty: 4, per: 'student' },
        ],
        { kind: 'build', minutes: 25 },
      ),
      activity(
        'Code the rover',
        [
          { partCode: 'RB-001', qty: 1, per: 'group' },
          { partCode: 'RB-020', qty: 2, per: 'group' },
        ],
        { kind: 'code', minutes: 15 },
      ),
    ],
  };
}
