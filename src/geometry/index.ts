export * from './types.js';
export * from './wgs84.js';
export * from './refraction.js';
export * from './mask.js';
export * from './doppler.js';
export * from './station.js';
export * from './spec.js';
export * from './columns.js';
