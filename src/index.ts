/**
 * passbudget public library API. Every CLI command is a call a user can make from here.
 */
export * from './errors.js';
export * from './orbit/time.js';
export * from './elements/index.js';
export * from './orbit/index.js';
export * from './geometry/index.js';
export * from './passes/index.js';
export * from './models/index.js';
export * from './budget/index.js';
export * from './scenario/index.js';
export * from './analysis/index.js';
export * from './output/index.js';
export * from './sweep/index.js';
export * from './jobs/index.js';
export { planContacts, type ContactPlan, type HorizonResult, type SatelliteDay } from './plan/plan.js';
export type { Candidate } from './plan/candidates.js';
