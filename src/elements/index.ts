export * from './types.js';
export * from './checksum.js';
export * from './catalog.js';
export * from './tle.js';
export * from './omm.js';
export * from './load.js';
export * from './select.js';
export * from './ommXml.js';
