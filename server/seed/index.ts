export { seedDemo, addSeedStep, DEMO_ACCOUNTS, DEMO_PASSWORD } from './demo.js';
