/**
 * "Smart Gates", the demo's Year 6 unit on the Gate Sensor Kit (invented content): four lessons
 * for 6T on Thursdays, Period 4, in term 3 of 2026. Each gate tub holds two gate sets, so eight
 * groups share four tubs.
 */
import {
  consumable,
  perGroup as g,
  perStudent as s,
  type LessonSeed,
  type MaterialSeed,
  type UnitSeed,
} from './planning-units.js';

const CONTROLLER = 'GS-001';
const SERVO = 'GS-002';
const LIGHT_GATE = 'GS-003';
const CABLE = 'GS-004';
const STATUS_LIGHT = 'GS-010';
const TOY_CAR = 'GS-011';
const STICKY = 'Sticky notes';

/** The gate itself: frame, arm and servo, one cable per connected device. */
function gate(cables: number): MaterialSeed[] {
  return [
    g(CONTROLLER, 1),
    g(SERVO, 1),
    g(CABLE, cables),
    g('GS-005', 2), // arm struts
    g('GS-006', 2), // post frames
    g('GS-007', 1), // base plate
    g('GS-009', 1), // drive rod
    s('GS-008', 3), // snap pegs
  ];
}

const CAUTIONS =
  '**Cautions** (the school’s policies come first): pegs and toy cars are small parts — count ' +
  'them back in. Charge controllers on a hard surface, never unattended overnight; a swollen or ' +
  'hot battery is taken out of use. Keep cables out of walkways.';

export const SMART_GATES: UnitSeed = {
  title: 'Smart Gates',
  yearLevel: 6,
  learningArea: 'Digital Technologies',
  term: 3,
  status: 'draft',
  visibility: 'private',
  outcomeCodes: ['KRDT-6.2', 'KRDT-6.3', 'KRDT-6.4', 'KRDT-6.5'],
  overview: [
    '## Smart Gates',
    '',
    'The school car park gets busy at pick-up time. Teams design a gate that opens by itself when',
    'a car arrives and shows when it is safe to go.',
    '',
    '- **Week 1:** inputs, outputs and the gate frame.',
    '- **Week 2:** program the gate arm.',
    '- **Week 3:** sense the car with a light gate.',
    '- **Week 4:** add a status light, test and evaluate.',
  ].join('\n'),
};

export const SMART_GATES_LESSONS: LessonSeed[] = [
  {
    date: '2026-07-23',
    title: 'Inputs, outputs and a gate that thinks',
    groupSize: 4,
    learningIntention: 'We are learning to **describe a system** by its inputs and outputs.',
    successCriteria:
      '- I can name the input and the output of an automatic gate.\n' +
      '- I can build a gate frame with a moving arm.',
    reliefNotes: CAUTIONS,
    activities: [
      {
        title: 'What makes a gate smart?',
        kind: 'intro',
        minutes: 8,
        materials: [
          consumable(STICKY, 3, 'student'),
          consumable('Spare battery pack', 1, 'class', true),
        ],
      },
      { title: 'Build the gate frame and arm', kind: 'build', minutes: 22, materials: gate(1) },
      {
        title: 'Sketch your gate’s inputs and outputs',
        kind: 'reflect',
        minutes: 5,
        materials: [consumable(STICKY, 1, 'student')],
      },
    ],
  },
  {
    date: '2026-07-30',
    title: 'Program the gate arm',
    groupSize: 4,
    learningIntention: 'We are learning to **sequence outputs with waits** between them.',
    successCriteria:
      '- I can raise the arm, wait and lower it.\n- I can change the wait to suit a slow car.',
    reliefNotes: CAUTIONS,
    activities: [
      { title: 'Check the frame and arm', kind: 'build', minutes: 6, materials: gate(1) },
      {
        title: 'Raise, wait, lower',
        kind: 'code',
        minutes: 20,
        materials: [g(CONTROLLER, 1), g(SERVO, 1)],
      },
      {
        title: 'Let the toy car through',
        kind: 'test',
        minutes: 9,
        materials: [g(TOY_CAR, 1), consumable('Masking tape', 1, 'group')],
      },
    ],
  },
  {
    date: '2026-08-06',
    title: 'Sense the car: the light gate',
    groupSize: 4,
    learningIntention: 'We are learning to **respond to an event** from a sensor.',
    successCriteria:
      '- I can fit the light-gate sensor across the lane.\n' +
      '- I can open the gate only when the beam is broken.\n- I can test it with ten cars.',
    reliefNotes: CAUTIONS,
    activities: [
      {
        title: 'Fit the light-gate sensor',
        kind: 'build',
        minutes: 10,
        materials: [...gate(2), g(LIGHT_GATE, 1)],
      },
      {
        title: 'Open when the beam is broken',
        kind: 'code',
        minutes: 16,
        materials: [g(CONTROLLER, 1), g(LIGHT_GATE, 1)],
      },
      {
        title: 'Ten cars, ten openings?',
        kind: 'test',
        minutes: 9,
        materials: [g(TOY_CAR, 1), consumable(STICKY, 1, 'student')],
      },
    ],
  },
  {
    date: '2026-08-13',
    title: 'Status light, testing and evaluation',
    groupSize: 4,
    learningIntention: 'We are learning to **evaluate a solution** against what its users need.',
    successCriteria:
      '- I can show green to go and red to wait.\n- I can test against our success criteria.\n' +
      '- I can say whether our gate would be safe at the school gate.',
    reliefNotes: CAUTIONS,
    activities: [
      {
        title: 'Add the status light',
        kind: 'build',
        minutes: 8,
        materials: [...gate(3), g(LIGHT_GATE, 1), g(STATUS_LIGHT, 1)],
      },
      {
        title: 'Green to go, red to wait',
        kind: 'code',
        minutes: 12,
        materials: [g(CONTROLLER, 1), g(STATUS_LIGHT, 1)],
      },
      {
        title: 'Test against the success criteria',
        kind: 'test',
        minutes: 10,
        materials: [g(TOY_CAR, 1), consumable(STICKY, 1, 'student')],
      },
      {
        title: 'Would it work at the school gate?',
        kind: 'reflect',
        minutes: 6,
        materials: [consumable(STICKY, 1, 'student')],
      },
    ],
  },
];
