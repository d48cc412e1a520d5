/**
 * "Rescue Rovers", weeks 5–8: the distance and colour sensors, the winch, the challenge. Week 5
 * needs a distance sensor in every group while Tub 5 has none; week 8 is planned a little long.
 */
import { consumable, perGroup as g, perStudent as s, type LessonSeed } from './planning-units.js';
import {
  BRACKET,
  ROD_35,
  ROD_110,
  ROD_CLIP,
  STRUT_176,
  COLOUR,
  CONTROLLER,
  CORD,
  DISTANCE,
  FIGURE,
  FLAT_PLATE,
  GEAR_12,
  GEAR_24,
  MOTOR_CABLE,
  PEG,
  SENSOR_CABLE,
  SPARE_BATTERY,
  STICKY,
  TAPE,
  TAPE_MEASURE,
  TOUCH,
  TRACK,
  WINCH_MOTOR,
  WORM,
  chassis,
  relief,
} from './planning-rovers-kit.js';

export const ROVERS_WEEKS_5_8: LessonSeed[] = [
  {
    date: '2026-08-25',
    title: 'Stop before the wall: the distance sensor',
    groupSize: 4,
    learningIntention: 'We are learning to **compare a sensor reading** with a number we choose.',
    successCriteria:
      '- I can mount the distance sensor facing forward.\n' +
      '- I can make the rover stop 10 cm from the wall.\n- I can record three test results.',
    reliefNotes: relief(
      'Tub 5 has no distance sensor: check the prep plan for where that group works.',
    ),
    activities: [
      {
        title: 'Mount the distance sensor',
        kind: 'build',
        minutes: 10,
        materials: [
          ...chassis(8),
          g(DISTANCE, 1),
          g(SENSOR_CABLE, 1),
          g(STRUT_176, 1),
          s(ROD_CLIP, 4),
        ],
      },
      {
        title: 'Stop 10 cm from the wall',
        kind: 'code',
        minutes: 14,
        materials: [g(CONTROLLER, 1), g(DISTANCE, 1)],
      },
      {
        title: 'Test at three distances',
        kind: 'test',
        minutes: 9,
        materials: [consumable(TAPE_MEASURE, 1, 'group', true), consumable(STICKY, 1, 'student')],
      },
      {
        title: 'What did the sensor see?',
        kind: 'reflect',
        minutes: 3,
        materials: [consumable(STICKY, 1, 'student')],
      },
    ],
  },
  {
    date: '2026-09-01',
    title: 'Follow the line to the rescue site',
    groupSize: 4,
    learningIntention: 'We are learning to **repeat a decision** so the rover follows a line.',
    successCriteria:
      '- I can mount the colour sensor close to the floor.\n' +
      '- I can program: on the line turn one way, off the line turn the other.\n' +
      '- I can time a lap of the track.',
    reliefNotes: relief(
      'One track sheet per group, taped to the floor. The stopwatch is on the class tray.',
    ),
    activities: [
      {
        title: 'Mount the colour sensor under the chassis',
        kind: 'build',
        minutes: 10,
        materials: [
          ...chassis(8),
          g(COLOUR, 1),
          g(SENSOR_CABLE, 1),
          g(ROD_35, 2),
          g(FLAT_PLATE, 2),
        ],
      },
      {
        title: 'Follow the black line',
        kind: 'code',
        minutes: 16,
        materials: [g(CONTROLLER, 1), g(COLOUR, 1), consumable(TRACK, 1, 'group')],
      },
      {
        title: 'Time a lap of the track',
        kind: 'test',
        minutes: 8,
        materials: [
          g(CONTROLLER, 1),
          consumable('Stopwatch', 1, 'class', true),
          consumable(SPARE_BATTERY, 1, 'class', true),
        ],
      },
      {
        title: 'Fastest or most careful?',
        kind: 'reflect',
        minutes: 3,
        materials: [consumable(STICKY, 1, 'student')],
      },
    ],
  },
  {
    date: '2026-09-08',
    title: 'Lift the rescue figure: gears and a winch',
    groupSize: 4,
    learningIntention: 'We are learning how **gears change speed and strength**.',
    successCriteria:
      '- I can explain which gear turns faster.\n- I can build a winch with a worm gear.\n' +
      '- I can lift the figure 10 cm and hold it.',
    reliefNotes: relief(
      'The winch motor goes in port C. Figures are small parts: count them back in.',
    ),
    activities: [
      {
        title: 'Gears: big turns small',
        kind: 'intro',
        minutes: 4,
        materials: [g(GEAR_12, 1), g(GEAR_24, 1)],
      },
      {
        title: 'Build the winch',
        kind: 'build',
        minutes: 18,
        materials: [
          ...chassis(6),
          g(WINCH_MOTOR, 1),
          g(MOTOR_CABLE, 1),
          g(WORM, 1),
          g(GEAR_24, 1),
          g(ROD_110, 1),
          g(CORD, 1),
          g(STRUT_176, 2),
          s(PEG, 2),
        ],
      },
      {
        title: 'Lift the figure 10 cm',
        kind: 'test',
        minutes: 10,
        materials: [g(CONTROLLER, 1), g(FIGURE, 1), consumable(TAPE, 1, 'group')],
      },
      {
        title: 'Which gear helped most?',
        kind: 'reflect',
        minutes: 3,
        materials: [consumable(STICKY, 1, 'student')],
      },
    ],
  },
  {
    date: '2026-09-15',
    title: 'Rescue Rovers challenge',
    groupSize: 4,
    learningIntention: 'We are learning to **test and improve** a whole solution.',
    successCriteria:
      '- Our rover follows the line, stops at the wall and lifts the figure.\n' +
      '- I can say one thing we improved after testing.\n- I can give another group kind feedback.',
    // Planned a little long on purpose: the prep plan shows the overrun.
    reliefNotes: relief('Keep to time: start pack-away when the plan says, even mid-run.'),
    activities: [
      {
        title: 'Final checks: bumper, line sensor and winch',
        kind: 'build',
        minutes: 8,
        materials: [
          ...chassis(8),
          g(TOUCH, 1),
          g(COLOUR, 1),
          g(SENSOR_CABLE, 2),
          g(WINCH_MOTOR, 1),
          g(MOTOR_CABLE, 1),
          g(WORM, 1),
          g(GEAR_24, 1),
          g(ROD_110, 1),
          g(CORD, 1),
          g(BRACKET, 2),
        ],
      },
      {
        title: 'Run the rescue course',
        kind: 'test',
        minutes: 24,
        materials: [
          g(CONTROLLER, 1),
          g(FIGURE, 1),
          consumable(TRACK, 1, 'group'),
          consumable(SPARE_BATTERY, 1, 'class', true),
        ],
      },
      {
        title: 'Gallery walk and evaluation',
        kind: 'reflect',
        minutes: 8,
        materials: [consumable(STICKY, 3, 'student')],
      },
    ],
  },
];
