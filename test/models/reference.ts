/**
 * Reads the ITU-R SG3 validation tables in ../shared/reference/itu-r/ (see its
 * README: CG-3M3J-13-ValEx workbook as CSV). When the folder is absent (a
 * fresh clone elsewhere) `loadTable` returns null and the caller skips with a
 * visible message naming the missing path.
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';

export const REFERENCE_DIR = path.resolve(process.cwd(), '../shared/reference/itu-r');

export type Row = Record<string, number>;

export function referencePath(file: string): string {
  return path.join(REFERENCE_DIR, file);
}

export function loadTable(file: string): Row[] | null {
  const p = referencePath(file);
  if (!existsSync(p)) {
    console.warn(`SKIPPED: reference table missing: ${p}`);
    return null;
  }
  const lines = readFileSync(p, 'utf8').split(/\r?\n/).filter((l) => l.trim() !== '');
  const header = lines[0].split(',').map((h) => h.trim());
  return lines.slice(1).map((line) => {
    const cells = line.split(',');
    const row: Row = {};
    header.forEach((h, i) => { row[h] = Number(cells[i]); });
    return row;
  });
}

/** |actual − expected| ≤ tol · |expected| (relative error; tolerance per the reference README). */
export function relativeError(actual: number, expected: number): number {
  return expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
}
