/**
 * TLE modulo-10 checksum over columns 1–68: digits count their value, a minus
 * sign counts 1, every other character 0 (NORAD two-line element format, as
 * described in Spacetrack Report #3 / Vallado et al., AIAA 2006-6753).
 */
export function tleChecksum(line: string): number {
  let sum = 0;
  const n = Math.min(line.length, 68);
  for (let i = 0; i < n; i++) {
    const c = line.charCodeAt(i);
    if (c >= 48 && c <= 57) sum += c - 48;
    else if (c === 45) sum += 1;
  }
  return sum % 10;
}

/** Replace column 69 of a 68/69-character line with its correct checksum digit. */
export function withTleChecksum(line: string): string {
  const body = line.slice(0, 68).padEnd(68, ' ');
  return body + String(tleChecksum(body));
}
