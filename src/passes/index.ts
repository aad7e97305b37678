export * from './types.js';
export * from './search.js';
export * from './scanstep.js';
export * from './find.js';
export * from './table.js';
