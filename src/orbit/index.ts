export * from './time.js';
export * from './errors.js';
export * from './frames.js';
export * from './propagator.js';
