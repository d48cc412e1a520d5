/**
 * The parts, consumables and cautions the "Rescue Rovers" lessons are written with. Part codes
 * are those of the invented Rover Builder Tub (planning-kits.ts).
 */
import { perGroup as g, perStudent as s, type MaterialSeed } from './planning-units.js';

export const CONTROLLER = 'RB-001';
export const DRIVE_MOTOR = 'RB-003';
export const WINCH_MOTOR = 'RB-004';
export const DISTANCE = 'RB-005';
export const COLOUR = 'RB-006';
export const TOUCH = 'RB-007';
export const MOTOR_CABLE = 'RB-008';
export const SENSOR_CABLE = 'RB-009';
export const ROD_35 = 'RB-013';
export const ROD_110 = 'RB-015';
export const GEAR_12 = 'RB-016';
export const GEAR_24 = 'RB-017';
export const WORM = 'RB-019';
export const STRUT_176 = 'RB-022';
export const BRACKET = 'RB-023';
export const FLAT_PLATE = 'RB-026';
export const PEG = 'RB-027';
export const DOUBLE_PEG = 'RB-028';
export const ROD_CLIP = 'RB-029';
export const SPACER = 'RB-030';
export const CORD = 'RB-031';
export const FIGURE = 'RB-032';

export const STICKY = 'Sticky notes';
export const TAPE = 'Masking tape';
export const TAPE_MEASURE = 'Tape measure';
export const TRACK = 'Printed track sheet (A3)';
export const SPARE_BATTERY = 'Spare battery pack';

/** The two-motor rover every lesson drives: its parts per group, pegs per student. */
export function chassis(pegsPerStudent: number): MaterialSeed[] {
  return [
    g(CONTROLLER, 1),
    g(DRIVE_MOTOR, 2),
    g(MOTOR_CABLE, 2),
    g('RB-010', 2), // wheel hubs
    g('RB-011', 2), // tyres
    g('RB-012', 1), // caster
    g('RB-014', 2), // 60 mm drive rods
    g('RB-024', 1), // chassis frame
    g('RB-021', 2), // 112 mm struts
    g('RB-020', 4), // 64 mm struts
    g(SPACER, 4),
    s(PEG, pegsPerStudent),
  ];
}

/** The cautions every relief teacher reads (the school's own policies come first). */
export const CAUTIONS =
  '**Cautions** (the school’s policies come first): pegs, clips, spacer rings and figures are small parts — ' +
  'keep them in the trays and count them back in. Controllers charge on a hard surface, not ' +
  'unattended overnight unless the school allows it; a swollen or hot battery is taken out of ' +
  'use. A controller or tablet that gets hot is switched off and left to cool for about fifteen ' +
  'minutes. Keep tubs and cables off the floor and out of walkways.';

/** A lesson's relief notes followed by the cautions. */
export function relief(notes: string): string {
  return `${notes}\n\n${CAUTIONS}`;
}
