/**
 * "Rescue Rovers", the demo's Year 4 unit on the Rover Builder Tub (invented content). Eight
 * weekly lessons for 4K on Tuesdays, Period 3, in term 3 of 2026 (no lesson on the pupil-free
 * Tuesday, 11 August). Two lessons are short on purpose so the prep plan has something to say:
 * lesson 2 runs in groups of three (nine groups, seven usable controllers) and lesson 5 needs a
 * distance sensor in every group while Tub 5 has lost its own.
 */
import type { LessonSeed, UnitSeed } from './planning-units.js';
import { relief } from './planning-rovers-kit.js';
import { ROVERS_WEEKS_1_4 } from './planning-rovers-weeks-1-4.js';
import { ROVERS_WEEKS_5_8 } from './planning-rovers-weeks-5-8.js';

export const RESCUE_ROVERS: UnitSeed = {
  title: 'Rescue Rovers',
  yearLevel: 4,
  learningArea: 'Digital Technologies',
  term: 3,
  status: 'draft',
  visibility: 'school',
  outcomeCodes: ['KRDT-4.1', 'KRDT-4.3', 'KRDT-4.4', 'KRDT-4.5', 'KRDT-4.6'],
  overview: [
    '## Rescue Rovers',
    '',
    'A flood has cut off the town and our rovers must reach the people who need help. Over eight',
    'weeks each group builds and programs a rover that drives, turns, senses and lifts.',
    '',
    '- **Weeks 1–3:** build the chassis, drive straight, turn and repeat.',
    '- **Weeks 4–6:** add a touch, a distance and a colour sensor.',
    '- **Weeks 7–8:** build a winch and run the rescue course.',
    '',
    'Groups of four share one tub; every group pairs its tablet with the controller in its tub.',
  ].join('\n'),
};

/** The eight lessons for 4K, weekly on Tuesdays. */
export const RESCUE_ROVERS_LESSONS: LessonSeed[] = [...ROVERS_WEEKS_1_4, ...ROVERS_WEEKS_5_8];

/** The partner's copy for 4M: the first three lessons, on Wednesdays, in groups of four. */
export const RESCUE_ROVERS_4M: UnitSeed = {
  ...RESCUE_ROVERS,
  title: 'Rescue Rovers (4M)',
  overview:
    `${RESCUE_ROVERS.overview}\n\n` +
    '_4M copy: 25 students, seven groups, Wednesdays after lunch._',
};

export const RESCUE_ROVERS_4M_LESSONS: LessonSeed[] = [
  '2026-07-22',
  '2026-07-29',
  '2026-08-05',
].map((date, i) => {
  const lesson = RESCUE_ROVERS_LESSONS[i]!;
  // The copy's own relief notes: the original's third lesson speaks of its owner's absence.
  const reliefNotes =
    i === 2
      ? relief('The taped squares are in the hall; book it at the office.')
      : lesson.reliefNotes;
  return { ...lesson, date, groupSize: 4, relief: false, reliefNotes };
});
