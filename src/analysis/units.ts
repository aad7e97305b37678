/**
 * Unit conversions for output columns. Volumes are carried in bits inside the
 * library; `volume_mb` columns are megabytes of 10^6 bytes (SI, not 2^20),
 * so 1 MB = 8·10^6 bits.
 */

/** Bits in one megabyte of 10^6 bytes. */
export const BITS_PER_MEGABYTE = 8e6;

/** Bits → megabytes of 10^6 bytes (for `volume_mb` columns). */
export function bitsToMegabytes(bits: number): number {
  return bits / BITS_PER_MEGABYTE;
}

/** Megabytes of 10^6 bytes → bits. */
export function megabytesToBits(megabytes: number): number {
  return megabytes * BITS_PER_MEGABYTE;
}

/** Seconds → minutes (for `*_min` columns). */
export function secondsToMinutes(seconds: number): number {
  return seconds / 60;
}
