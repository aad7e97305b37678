/**
 * SGP4 error codes (Vallado et al., AIAA 2006-6753, sgp4 routine; the codes
 * satellite.js copies into `satrec.error`) and their user-facing meaning.
 */
export const SGP4_ERROR_TEXT: Record<number, string> = {
  1: 'mean eccentricity out of range (allowed 0 <= e < 1)',
  2: 'mean motion fell below zero (the element set cannot be propagated this far)',
  3: 'perturbed eccentricity out of range (allowed 0 <= e < 1; element set not valid this far from its epoch)',
  4: 'semi-latus rectum fell below zero (the element set cannot be propagated this far)',
  5: 'epoch elements are sub-orbital (legacy code; perigee below the Earth surface)',
  6: 'satellite has decayed (computed radius below one Earth radius)',
};

export function sgp4ErrorText(code: number): string {
  return SGP4_ERROR_TEXT[code] ?? `unknown SGP4 error code ${code}`;
}
