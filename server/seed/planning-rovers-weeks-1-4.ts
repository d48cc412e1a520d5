/**
 * "Rescue Rovers", weeks 1–4: chassis, driving straight (in groups of three), loops, the touch
 * sensor. Week 2 has nine groups for seven usable tubs: short of controllers on purpose.
 */
import { consumable, perGroup as g, perStudent as s, type LessonSeed } from './planning-units.js';
import {
  BRACKET,
  CONTROLLER,
  DRIVE_MOTOR,
  DOUBLE_PEG,
  MOTOR_CABLE,
  SENSOR_CABLE,
  SPARE_BATTERY,
  STICKY,
  TAPE,
  TAPE_MEASURE,
  TOUCH,
  chassis,
  relief,
} from './planning-rovers-kit.js';

export const ROVERS_WEEKS_1_4: LessonSeed[] = [
  {
    date: '2026-07-21',
    title: 'Meet the rover: tubs, parts and pairing',
    groupSize: 4,
    learningIntention: 'We are learning to **find and name the parts** of a rover before we build.',
    successCriteria:
      '- I can find a part by its tray compartment.\n- I can help build the chassis.\n' +
      '- I can pair our tablet with our controller.',
    reliefNotes: relief(
      'Controllers are on charge on the trolley from 07:55. Read the tub tour slide, then let ' +
        'each group build from the picture card. Pairing: the controller label is on the tub lid.',
    ),
    activities: [
      {
        title: 'Tub tour and care of parts',
        kind: 'intro',
        minutes: 8,
        materials: [
          consumable(STICKY, 2, 'student'),
          g(CONTROLLER, 1),
          consumable(SPARE_BATTERY, 1, 'class', true),
        ],
      },
      {
        title: 'Build the rover chassis',
        kind: 'build',
        minutes: 20,
        materials: [...chassis(8), consumable(TAPE, 1, 'group')],
      },
      {
        title: 'Pair the tablet and spin the motors',
        kind: 'code',
        minutes: 8,
        materials: [g(CONTROLLER, 1), g(DRIVE_MOTOR, 2), g(MOTOR_CABLE, 2)],
      },
    ],
  },
  {
    date: '2026-07-28',
    title: 'Drive straight: everyone codes',
    // Groups of three so that everyone gets a turn at the tablet: more groups than controllers.
    groupSize: 3,
    learningIntention:
      'We are learning to **write a sequence of steps** that drives a set distance.',
    successCriteria:
      '- I can put drive, wait and stop blocks in order.\n' +
      '- I can change one number to make the rover go further.\n- I can measure how far it went.',
    reliefNotes: relief(
      'Tape a start line for each group before the lesson. If a group has no controller, it ' +
        'pairs with the next group and takes turns.',
    ),
    activities: [
      {
        title: 'Programs are sequences of steps',
        kind: 'intro',
        minutes: 5,
        materials: [consumable(STICKY, 1, 'student'), consumable(TAPE, 1, 'group')],
      },
      {
        title: 'Check the chassis and fit the tyres',
        kind: 'build',
        minutes: 10,
        materials: chassis(4),
      },
      {
        title: 'Drive one metre and stop',
        kind: 'code',
        minutes: 15,
        materials: [g(CONTROLLER, 1), g(DRIVE_MOTOR, 2)],
      },
      {
        title: 'Measure how far it went',
        kind: 'test',
        minutes: 5,
        materials: [g(CONTROLLER, 1), consumable(TAPE_MEASURE, 1, 'group', true)],
      },
    ],
  },
  {
    date: '2026-08-04',
    title: 'Turn and repeat: squares with loops',
    groupSize: 4,
    relief: true,
    learningIntention: 'We are learning to **use a repeat** to make a program shorter.',
    successCriteria:
      '- I can make the rover turn a quarter turn.\n- I can use a repeat block four times.\n' +
      '- I can explain why the repeat makes the program shorter.',
    reliefNotes: relief(
      'Sam is away at a workshop: this lesson is yours. The taped squares on the hall floor stay ' +
        'down all week. Collect the sticky notes for Sam.',
    ),
    activities: [
      { title: 'Take out and check the rover', kind: 'build', minutes: 6, materials: chassis(8) },
      {
        title: 'Turn 90°, then repeat it four times',
        kind: 'code',
        minutes: 16,
        materials: [g(CONTROLLER, 1)],
      },
      {
        title: 'Drive the taped square',
        kind: 'test',
        minutes: 9,
        materials: [g(CONTROLLER, 1), consumable(TAPE, 1, 'group')],
      },
      {
        title: 'Two stars and a wish',
        kind: 'reflect',
        minutes: 4,
        materials: [consumable(STICKY, 2, 'student')],
      },
    ],
  },
  {
    date: '2026-08-18',
    title: 'Bump and stop: the touch sensor',
    groupSize: 4,
    learningIntention: 'We are learning to **use a sensor reading** to decide what happens next.',
    successCriteria:
      '- I can fit a bumper that presses the touch sensor.\n' +
      '- I can program the rover to stop when it bumps.\n- I can test it three times.',
    reliefNotes: relief('Show the bumper picture card. The sensor cable goes in port 1.'),
    activities: [
      {
        title: 'Fit a bumper with the touch sensor',
        kind: 'build',
        minutes: 12,
        materials: [
          ...chassis(8),
          g(TOUCH, 1),
          g(SENSOR_CABLE, 1),
          g(BRACKET, 2),
          s(DOUBLE_PEG, 1),
        ],
      },
      {
        title: 'Stop when the bumper is pressed',
        kind: 'code',
        minutes: 14,
        materials: [g(CONTROLLER, 1), g(TOUCH, 1)],
      },
      {
        title: 'Bump test along the wall',
        kind: 'test',
        minutes: 7,
        materials: [g(CONTROLLER, 1), consumable(TAPE, 1, 'group')],
      },
      {
        title: 'Tell your partner what changed',
        kind: 'reflect',
        minutes: 3,
        materials: [consumable(STICKY, 1, 'student')],
      },
    ],
  },
];
