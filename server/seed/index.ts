import { addSeedStep } from './demo.js';
import { seedPlanning } from './planning.js';

addSeedStep(seedPlanning);

export { seedDemo, addSeedStep, DEMO_ACCOUNTS, DEMO_PASSWORD } from './demo.js';
