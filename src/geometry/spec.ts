/**
 * Station from a compact text form, as given on a command line:
 * `LAT,LON[,HEIGHT_M]` or `NAME=LAT,LON[,HEIGHT_M]` (degrees, metres above WGS-84).
 */
import { InputError } from '../errors.js';
import type { HorizonMask, Station } from './types.js';
import { validateStation } from './station.js';

export function parseStationSpec(spec: string, where: string, fallbackName: string, mask: HorizonMask): Station {
  const m = /^\s*(?:([^=]+)=)?\s*(.*)$/.exec(spec)!;
  const name = (m[1] ?? '').trim() || fallbackName;
  const parts = m[2].split(',').map((s) => s.trim());
  if (parts.length < 2 || parts.length > 3 || parts.some((p) => !/^[+-]?(\d+\.?\d*|\.\d+)$/.test(p))) {
    throw new InputError(`${where}: station ${JSON.stringify(spec)} is not LAT,LON[,HEIGHT_M] (allowed e.g. 68.40,17.25,120 or Kaldfjell=68.40,17.25,120)`);
  }
  const [lat, lon, h] = parts.map(Number);
  return validateStation({ name, latitudeDeg: lat, longitudeDeg: lon, heightM: h ?? 0, mask }, where);
}
