export * from './types.js';
export * from './antenna.js';
export * from './attitude.js';
export * from './mount.js';
export * from './atmosphere.js';
export * from './columns.js';
export * from './engine.js';
export * from './explain.js';
