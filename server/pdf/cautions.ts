/**
 * Section 7 of a lesson pack: the usual cautions for hands-on kit lessons, in Trayplan's own
 * words, always deferring to the school's policies and local regulations. The lesson's own small
 * and rechargeable parts are named so the cautions are about this lesson, not kits in general.
 */
import type { Content } from './content.js';
import { sectionTitle } from './layout.js';
import { listing } from './format.js';
import type { LessonPackModel } from './model.js';

/** The cautions every pack prints: a heading and what to do. */
export const CAUTIONS: readonly { title: string; text: string }[] = [
  {
    title: 'Small parts',
    text:
      'Pegs, clips, spacer rings, short rods and figures are small enough to be swallowed or breathed in: they ' +
      'are a choking hazard. Keep the kits away from young children, keep small parts in their ' +
      'trays while building, and count them back in at pack-away.',
  },
  {
    title: 'Batteries and charging',
    text:
      'Charge controllers and battery packs on a hard surface that does not burn, never on carpet, ' +
      'paper or a bag. Do not leave them charging unattended or overnight unless your school’s ' +
      'policy allows it. Take a battery that is swollen, hot, leaking or damaged out of use at ' +
      'once, keep it somewhere safe and report it the way your school asks.',
  },
  {
    title: 'Devices that overheat',
    text:
      'A controller or tablet that gets hot under long use is switched off and left to cool ' +
      'before anyone uses it again; about fifteen minutes is usual.',
  },
  {
    title: 'Chargers and power boards',
    text:
      'Use only chargers, leads and power boards that have passed your school’s electrical ' +
      'testing and tagging. Check leads for damage before use, do not plug one power board into ' +
      'another, and switch off at the wall when charging is done.',
  },
  {
    title: 'Walkways',
    text:
      'Keep tubs, bags and cables off the floor and clear of walkways and doors, and run charging ' +
      'leads where nobody can trip on them.',
  },
];

/** Section 7 (also printed for a lesson that cannot be planned yet). */
export function cautions(lesson: LessonPackModel): Content[] {
  const used = lesson.parts;
  const small = used.filter((p) => p.small).map((p) => p.name);
  const rechargeable = used.filter((p) => p.rechargeable).map((p) => p.name);
  const inThisLesson: Record<string, string> = {};
  if (small.length) inThisLesson['Small parts'] = `Small parts in this lesson: ${listing(small)}.`;
  if (rechargeable.length) {
    inThisLesson['Batteries and charging'] =
      `Rechargeable in this lesson: ${listing(rechargeable)}.`;
  }
  return [
    sectionTitle(
      'Cautions',
      'General cautions for kit lessons, in Trayplan’s words. Your school’s policies and local ' +
        'regulations come first: where they say something different, follow them.',
    ),
    ...CAUTIONS.flatMap((c) => [
      { text: c.title, style: 'heading' },
      { text: c.text, style: 'body' },
      ...(inThisLesson[c.title]
        ? [{ text: inThisLesson[c.title]!, style: 'body', bold: true, margin: [0, 3, 0, 0] }]
        : []),
    ]),
    {
      text: 'If someone is hurt, follow your school’s first-aid and incident procedures.',
      style: 'body',
      italics: true,
      margin: [0, 14, 0, 0],
    },
  ];
}
