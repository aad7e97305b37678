/**
 * Rain rate exceeded for 0.01 % of an average year by rain-climate zone — the
 * zone table of the older ITU-R P.837-1 (from memory; a user should give a site
 * value of R0.01 from the current P.837 maps when available).
 */
export const RAIN_ZONE_R001_MM_H: Readonly<Record<string, number>> = Object.freeze({
  A: 8, B: 12, C: 15, D: 19, E: 22, F: 28, G: 30, H: 32, J: 35, K: 42, L: 60, M: 63, N: 95, P: 145, Q: 115,
});

/** R0.01 (mm/h) for a P.837-1 climate zone letter (from memory). Throws RangeError for an unknown zone. */
export function rainRateForZone(zone: string): number {
  const r = Object.prototype.hasOwnProperty.call(RAIN_ZONE_R001_MM_H, zone) ? RAIN_ZONE_R001_MM_H[zone] : undefined;
  if (r === undefined) {
    throw new RangeError(`rainRateForZone: zone = ${JSON.stringify(zone)} is outside ${Object.keys(RAIN_ZONE_R001_MM_H).join(', ')}`);
  }
  return r;
}
