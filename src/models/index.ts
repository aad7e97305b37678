/** Pure physics models, one file per published model (see each file for its source). */
export { checkAtLeast, checkRange, type Interval } from './range.js';
export * from './p525.js';
export * from './p676.js';
export * from './p838.js';
export * from './p618.js';
export * from './p839.js';
export * from './p837.js';
export * from './p840.js';
export * from './p453.js';
export * from './p372.js';
export * from './p531.js';
// ITU-R P.834 refraction lives in src/geometry/refraction.ts (one implementation, applied to the apparent elevation as P.834 defines it).
export * from './noise.js';
export * from './antenna.js';
export * from './polarisation.js';
export * from './erfc.js';
export * from './ber.js';
export * from './modcod.js';
export * from './sun.js';
export * from './sunNoise.js';
export * from './elementError.js';
