/**
 * Catalogue numbers in TLE columns 3–7: five digits, or "alpha-5" where the
 * first character is a letter standing for 10–33 (I and O are skipped, as in
 * the alpha-5 scheme adopted for catalogue numbers above 99999).
 */
const ALPHA5 = 'ABCDEFGHJKLMNPQRSTUVWXYZ';

/** Numeric value of a catalogue field, or NaN when it is not one. */
export function catalogNumberValue(field: string): number {
  const s = field.trim();
  if (/^\d{1,5}$/.test(s)) return Number(s);
  if (/^[A-Z]\d{4}$/.test(s)) {
    const k = ALPHA5.indexOf(s[0]);
    if (k < 0) return NaN;
    return (k + 10) * 10_000 + Number(s.slice(1));
  }
  return NaN;
}
