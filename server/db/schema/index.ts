export * from './schools.js';
export * from './users.js';
export * from './sessions.js';
export * from './outbox.js';
