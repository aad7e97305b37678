/**
 * WGS-84 ellipsoid (NIMA TR8350.2): a = 6378.137 km, 1/f = 298.257223563.
 * Geodetic ↔ Earth-fixed conversions in km and degrees.
 */
export const WGS84_A_KM = 6378.137;
export const WGS84_F = 1 / 298.257223563;
export const WGS84_E2 = WGS84_F * (2 - WGS84_F);
const DEG = Math.PI / 180;

/** Geodetic latitude/longitude (deg) and height (km) → ECEF (km), written into `out`. */
export function geodeticToEcefKm(latDeg: number, lonDeg: number, heightKm: number, out: Float64Array = new Float64Array(3)): Float64Array {
  const phi = latDeg * DEG;
  const lam = lonDeg * DEG;
  const s = Math.sin(phi);
  const n = WGS84_A_KM / Math.sqrt(1 - WGS84_E2 * s * s);
  out[0] = (n + heightKm) * Math.cos(phi) * Math.cos(lam);
  out[1] = (n + heightKm) * Math.cos(phi) * Math.sin(lam);
  out[2] = (n * (1 - WGS84_E2) + heightKm) * s;
  return out;
}

export interface Geodetic { latitudeDeg: number; longitudeDeg: number; heightKm: number }

/**
 * ECEF (km) → geodetic, by fixed-point iteration on latitude (converges to
 * 1e-12 rad in a few steps for any point well above the Earth's centre).
 */
export function ecefToGeodetic(x: number, y: number, z: number, out: Geodetic = { latitudeDeg: 0, longitudeDeg: 0, heightKm: 0 }): Geodetic {
  const p = Math.hypot(x, y);
  let phi = Math.atan2(z, p * (1 - WGS84_E2));
  let n = WGS84_A_KM;
  for (let i = 0; i < 10; i++) {
    const s = Math.sin(phi);
    n = WGS84_A_KM / Math.sqrt(1 - WGS84_E2 * s * s);
    const next = Math.atan2(z + WGS84_E2 * n * s, p);
    if (Math.abs(next - phi) < 1e-13) { phi = next; break; }
    phi = next;
  }
  const s = Math.sin(phi);
  const c = Math.cos(phi);
  n = WGS84_A_KM / Math.sqrt(1 - WGS84_E2 * s * s);
  // Height form that stays accurate near the poles as well as the equator.
  out.heightKm = p * c + z * s - WGS84_A_KM * Math.sqrt(1 - WGS84_E2 * s * s);
  out.latitudeDeg = phi / DEG;
  out.longitudeDeg = Math.atan2(y, x) / DEG;
  return out;
}
