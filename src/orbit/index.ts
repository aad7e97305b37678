export * from './time.js';
