import type { SeedStep } from './demo.js';

/** The planning part of the demo school (kits, classes, units…). Filled in by the planning work. */
export const seedPlanning: SeedStep = async () => {};
