/**
 * The invented outcomes framework of the demo school. The codes and wording are Trayplan's own,
 * written for the demo; they are not taken from any published curriculum.
 */
import type { Tx } from '../db/client.js';
import { outcomeFrameworks, outcomes } from '../db/schema/index.js';
import { SEEDED_AT } from './planning-kits.js';

export const DEMO_FRAMEWORK = 'KR Digital Technologies (demo)';

const OUTCOMES: { code: string; strand: string; yearBand: string; description: string }[] = [
  {
    code: 'KRDT-4.1',
    strand: 'Designing',
    yearBand: '3–4',
    description: 'Sketch a build and name the parts it needs before taking them from the tub.',
  },
  {
    code: 'KRDT-4.2',
    strand: 'Designing',
    yearBand: '3–4',
    description:
      'Choose parts that suit a purpose: wheels to move, gears to lift, sensors to notice.',
  },
  {
    code: 'KRDT-4.3',
    strand: 'Programming',
    yearBand: '3–4',
    description: 'Write a sequence of steps that drives a rover a set distance and turns it.',
  },
  {
    code: 'KRDT-4.4',
    strand: 'Programming',
    yearBand: '3–4',
    description: 'Use a repeat to shorten a program that does the same steps again and again.',
  },
  {
    code: 'KRDT-4.5',
    strand: 'Programming',
    yearBand: '3–4',
    description: 'Use a sensor reading to decide what the program does next.',
  },
  {
    code: 'KRDT-4.6',
    strand: 'Evaluating',
    yearBand: '3–4',
    description: 'Test a build against the success criteria and record what to change next time.',
  },
  {
    code: 'KRDT-6.1',
    strand: 'Designing',
    yearBand: '5–6',
    description: 'Define a problem with its users and limits before designing a solution.',
  },
  {
    code: 'KRDT-6.2',
    strand: 'Designing',
    yearBand: '5–6',
    description: 'Design a system in which inputs (sensors) trigger outputs (motors, lights).',
  },
  {
    code: 'KRDT-6.3',
    strand: 'Programming',
    yearBand: '5–6',
    description: 'Write programs with variables, repeats and decisions that respond to events.',
  },
  {
    code: 'KRDT-6.4',
    strand: 'Programming',
    yearBand: '5–6',
    description: 'Find and fix a fault by changing one thing at a time and testing again.',
  },
  {
    code: 'KRDT-6.5',
    strand: 'Evaluating',
    yearBand: '5–6',
    description: 'Judge how well a solution meets the needs of its users, safety included.',
  },
  {
    code: 'KRDT-6.6',
    strand: 'Collaborating',
    yearBand: '5–6',
    description: 'Share team roles and look after time, parts and devices during a build.',
  },
];

/** Seeds the framework and returns its outcome ids by code. */
export async function seedOutcomes(tx: Tx, schoolId: string): Promise<Record<string, string>> {
  const [framework] = await tx
    .insert(outcomeFrameworks)
    .values({ schoolId, name: DEMO_FRAMEWORK, createdAt: SEEDED_AT })
    .returning();
  const rows = await tx
    .insert(outcomes)
    .values(OUTCOMES.map((o) => ({ frameworkId: framework!.id, ...o })))
    .returning({ id: outcomes.id, code: outcomes.code });
  return Object.fromEntries(rows.map((r) => [r.code, r.id]));
}
