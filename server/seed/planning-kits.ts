/**
 * The demo kit types and tubs. Every kit, part name and code here is invented for the demo; no
 * real kit's parts list is copied. A tub holds one full parts list; what it is known to be
 * missing is recorded per part code (stock = quantity − missing).
 */
import type { Tx } from '../db/client.js';
import { kitTypes, parts, tubAudits, tubMissing, tubs } from '../db/schema/index.js';
import type { PartCategory } from '../../shared/schemas/kits.js';

/** When the demo's records say they were made (before term 3): fixed, so seeding repeats. */
export const SEEDED_AT = new Date('2026-07-13T09:00:00+09:30');

/** One line of a seeded parts list. */
export interface PartSeed {
  code: string;
  name: string;
  colour: string;
  category: PartCategory;
  qty: number;
  compartment: string;
  small?: boolean;
  chargeMinutes?: number;
}

/** A parts-list line, written compactly: code, name, colour, category, qty, compartment. */
function part(
  code: string,
  name: string,
  colour: string,
  category: PartCategory,
  qty: number,
  compartment: string,
  flags: { small?: boolean; chargeMinutes?: number } = {},
): PartSeed {
  return { code, name, colour, category, qty, compartment, ...flags };
}

/**
 * Full charge of the rover controller from empty: a small rechargeable controller takes about
 * three hours (common practice, no published source).
 */
export const ROVER_CONTROLLER_CHARGE_MINUTES = 180;

/** "Rover Builder Tub": one group's rover, 193 pieces over 32 lines. */
export const ROVER_PARTS: PartSeed[] = [
  part('RB-001', 'Rover controller', 'Grey', 'controller', 1, 'A1', {
    chargeMinutes: ROVER_CONTROLLER_CHARGE_MINUTES,
  }),
  part('RB-002', 'USB charging cable', 'Black', 'cable', 1, 'A1'),
  part('RB-003', 'Drive motor', 'Grey', 'motor', 2, 'A2'),
  part('RB-004', 'Winch motor', 'Grey', 'motor', 1, 'A2'),
  part('RB-005', 'Distance sensor', 'White', 'sensor', 1, 'A3'),
  part('RB-006', 'Colour sensor', 'White', 'sensor', 1, 'A3'),
  part('RB-007', 'Touch sensor', 'White', 'sensor', 1, 'A3'),
  part('RB-008', 'Motor cable, 20 cm', 'Black', 'cable', 3, 'A4'),
  part('RB-009', 'Sensor cable, 30 cm', 'Black', 'cable', 3, 'A4'),
  part('RB-010', 'Wheel hub, 42 mm', 'Coral', 'wheel', 4, 'B1'),
  part('RB-011', 'Grip tyre, 42 mm', 'Charcoal', 'wheel', 4, 'B1'),
  part('RB-012', 'Caster ball wheel', 'Steel', 'wheel', 1, 'B1'),
  part('RB-013', 'Drive rod, 35 mm', 'Steel', 'axle', 6, 'B2'),
  part('RB-014', 'Drive rod, 60 mm', 'Steel', 'axle', 6, 'B2'),
  part('RB-015', 'Drive rod, 110 mm', 'Steel', 'axle', 4, 'B2'),
  part('RB-016', 'Spur gear, 10 teeth', 'Ivory', 'gear', 4, 'B3'),
  part('RB-017', 'Spur gear, 30 teeth', 'Ivory', 'gear', 4, 'B3'),
  part('RB-018', 'Spur gear, 50 teeth', 'Ivory', 'gear', 2, 'B3'),
  part('RB-019', 'Worm screw', 'Ivory', 'gear', 1, 'B3'),
  part('RB-020', 'Snap strut, 64 mm', 'Teal', 'structure', 8, 'C1'),
  part('RB-021', 'Snap strut, 112 mm', 'Teal', 'structure', 8, 'C1'),
  part('RB-022', 'Snap strut, 176 mm', 'Teal', 'structure', 4, 'C1'),
  part('RB-023', 'Corner bracket', 'Teal', 'structure', 6, 'C2'),
  part('RB-024', 'Chassis deck, 96 × 128 mm', 'Sand', 'structure', 2, 'C2'),
  part('RB-025', 'Base panel, 128 × 192 mm', 'Sand', 'plate', 2, 'C3'),
  part('RB-026', 'Cover panel, 32 × 64 mm', 'Sand', 'plate', 6, 'C3'),
  part('RB-027', 'Snap peg', 'Lime', 'connector', 40, 'D1', { small: true }),
  part('RB-028', 'Double snap peg', 'Violet', 'connector', 20, 'D1', { small: true }),
  part('RB-029', 'Rod clip', 'Amber', 'connector', 20, 'D2', { small: true }),
  part('RB-030', 'Spacer ring', 'Amber', 'connector', 24, 'D3', { small: true }),
  part('RB-031', 'Winch cord with hook', 'White', 'other', 1, 'E1'),
  part('RB-032', 'Rescue figure', 'Orange', 'figure', 2, 'E2', { small: true }),
];

/** "Gate Sensor Kit": a smaller tub holding two gate sets, so one tub serves two groups. */
export const GATE_PARTS: PartSeed[] = [
  part('GS-001', 'Gate controller', 'Grey', 'controller', 2, 'A1', { chargeMinutes: 120 }),
  part('GS-002', 'Servo motor', 'Grey', 'motor', 2, 'A2'),
  part('GS-003', 'Light-gate sensor pair', 'White', 'sensor', 2, 'A3'),
  part('GS-004', 'Connector cable, 25 cm', 'Black', 'cable', 6, 'A4'),
  part('GS-005', 'Gate arm strut', 'Teal', 'structure', 4, 'B1'),
  part('GS-006', 'Gate post frame', 'Sand', 'structure', 4, 'B1'),
  part('GS-007', 'Base panel, 64 × 128 mm', 'Sand', 'plate', 2, 'B2'),
  part('GS-008', 'Snap peg', 'Lime', 'connector', 30, 'C1', { small: true }),
  part('GS-009', 'Drive rod, 48 mm', 'Steel', 'axle', 4, 'C2'),
  part('GS-010', 'Status light module', 'Clear', 'display', 2, 'C3'),
  part('GS-011', 'Toy car', 'Yellow', 'figure', 3, 'D1', { small: true }),
];

/** Banksia Flat's only kit type, there to show that schools do not see each other's kits. */
const BANKSIA_PARTS: PartSeed[] = [
  part('PL-01', 'Pulley wheel', 'Yellow', 'wheel', 4, 'A'),
  part('PL-02', 'Lever arm', 'Blue', 'structure', 4, 'A'),
  part('PL-03', 'Peg', 'Lime', 'connector', 24, 'B', { small: true }),
  part('PL-04', 'Cord, 1 m', 'White', 'other', 2, 'B'),
];

/** What Tub 3 and Tub 5 are known to be missing (the rest are full). */
export const ROVER_MISSING: Record<string, { partCode: string; count: number }[]> = {
  // 12 pegs short of 40 leaves 28: a group of four needing 32 borrows 4 from another tub.
  'Tub 3': [
    { partCode: 'RB-027', count: 12 },
    { partCode: 'RB-011', count: 1 },
  ],
  // The only distance sensor is gone: a lesson where every group needs one is short a sensor.
  'Tub 5': [
    { partCode: 'RB-005', count: 1 },
    { partCode: 'RB-029', count: 6 },
  ],
};

/** The ids a lesson seed needs. */
export interface SeededKits {
  roverKitId: string;
  gateKitId: string;
  /** Tub ids in label order. */
  roverTubIds: string[];
  gateTubIds: string[];
}

async function insertKit(
  tx: Tx,
  schoolId: string,
  name: string,
  description: string,
  list: PartSeed[],
) {
  const [kit] = await tx
    .insert(kitTypes)
    .values({ schoolId, name, description, createdAt: SEEDED_AT })
    .returning();
  await tx.insert(parts).values(
    list.map((p, position) => ({
      kitTypeId: kit!.id,
      position,
      code: p.code,
      name: p.name,
      colour: p.colour,
      category: p.category,
      qty: p.qty,
      compartment: p.compartment,
      small: p.small ?? false,
      chargeMinutes: p.chargeMinutes ?? null,
    })),
  );
  return kit!.id;
}

/** Seeds Kestrel Ridge's two kit types, their tubs, the known missing parts and Tub 3's audit. */
export async function seedKits(tx: Tx, schoolId: string, auditorId: string): Promise<SeededKits> {
  const roverKitId = await insertKit(
    tx,
    schoolId,
    'Rover Builder Tub',
    'One group’s programmable rover: controller, two drive motors, a winch, three sensors ' +
      'and the frame to build on.',
    ROVER_PARTS,
  );
  const gateKitId = await insertKit(
    tx,
    schoolId,
    'Gate Sensor Kit',
    'Two sets per tub of a sensor-triggered gate: controller, servo arm, light-gate sensor ' +
      'and status light.',
    GATE_PARTS,
  );
  const roverTubs = await tx
    .insert(tubs)
    .values(
      Array.from({ length: 8 }, (_, i) => ({
        schoolId,
        kitTypeId: roverKitId,
        label: `Tub ${i + 1}`,
        controllerLabel: `RB-C${i + 1}`,
        // Tub 7 came back from another campus and has not been counted yet.
        status: i + 1 === 7 ? ('needs-sorting' as const) : ('ready' as const),
        createdAt: SEEDED_AT,
      })),
    )
    .returning();
  const gateTubs = await tx
    .insert(tubs)
    .values(
      Array.from({ length: 4 }, (_, i) => ({
        schoolId,
        kitTypeId: gateKitId,
        label: `Gate Tub ${i + 1}`,
        controllerLabel: `GC-${i + 1}A / GC-${i + 1}B`,
        status: 'ready' as const,
        createdAt: SEEDED_AT,
      })),
    )
    .returning();
  const byLabel = new Map(roverTubs.map((t) => [t.label, t.id]));
  for (const [label, lines] of Object.entries(ROVER_MISSING)) {
    await tx.insert(tubMissing).values(lines.map((l) => ({ tubId: byLabel.get(label)!, ...l })));
  }
  await tx.insert(tubAudits).values({
    tubId: byLabel.get('Tub 3')!,
    userId: auditorId,
    missing: [
      { partCode: 'RB-027', count: 12 },
      { partCode: 'RB-011', count: 1 },
    ],
    found: [],
    note:
      'Pack-away count at the end of term 2: 12 snap pegs and one tyre not returned. ' +
      'Lost-parts box and the carpet checked; reordered on the replacement list.',
    createdAt: new Date('2026-07-02T14:35:00+09:30'),
  });
  return {
    roverKitId,
    gateKitId,
    roverTubIds: roverTubs.map((t) => t.id),
    gateTubIds: gateTubs.map((t) => t.id),
  };
}

/** Banksia Flat: one kit type, nothing else, so isolation has something to hide. */
export async function seedBanksiaKit(tx: Tx, schoolId: string): Promise<string> {
  return insertKit(
    tx,
    schoolId,
    'Pulley and Lever Crate',
    'Simple machines for a small group: pulleys, levers, pegs and cord.',
    BANKSIA_PARTS,
  );
}
