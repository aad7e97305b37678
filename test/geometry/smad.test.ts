/**
 * Slant range and off-nadir angle against the spherical-Earth relations of
 * Wertz & Larson, Space Mission Analysis and Design (SMAD):
 *   sin η = R cos ε / (R + h),  λ = 90° − ε − η,  d = R sin λ / sin η.
 * Our geometry is on the WGS-84 ellipsoid, so the two differ by the
 * ellipsoid-versus-sphere effect. We state that difference by evaluating the
 * SMAD formulas with the two principal radii of curvature at the station
 * (meridian M and prime vertical N, the extremes of the local sphere fit) and
 * require our result to lie within that spread plus 0.2 % (range) and, for
 * η, plus the lean of our geocentric nadir from the local vertical plus 0.02°
 * (the sub-satellite point is up to 20° away, where the curvature differs).
 */
import { describe, expect, it } from 'vitest';
import type { Propagator } from '../../src/orbit/propagator.js';
import { gmstRad } from '../../src/orbit/frames.js';
import { createStationGeometry } from '../../src/geometry/station.js';
import { createGeometrySample } from '../../src/geometry/types.js';
import { ecefToGeodetic, geodeticToEcefKm, WGS84_A_KM, WGS84_E2 } from '../../src/geometry/wgs84.js';

const DEG = Math.PI / 180;

/** A propagator whose satellite sits at a fixed ECEF point (test harness for pure geometry). */
function fixedEcef(p: Float64Array, t: number): Propagator {
  const g = gmstRad(t);
  const c = Math.cos(g); const s = Math.sin(g);
  return {
    elements: null as never, satrec: null as never,
    minutesSinceEpoch: () => 0,
    stateTemeAtMinutes: () => { throw new Error('unused'); },
    stateTeme: (_t, r, v) => {
      r[0] = c * p[0] - s * p[1]; r[1] = s * p[0] + c * p[1]; r[2] = p[2];
      v[0] = 0; v[1] = 0; v[2] = 0;
    },
  };
}

function smad(R: number, h: number, elDeg: number): { d: number; eta: number } {
  const eta = Math.asin((R * Math.cos(elDeg * DEG)) / (R + h));
  const lam = Math.PI / 2 - elDeg * DEG - eta;
  return { d: (R * Math.sin(lam)) / Math.sin(eta), eta: eta / DEG };
}

/** ECEF point seen at (az, el) from the station whose geodetic height is h (bisection on distance). */
function pointAt(latDeg: number, lonDeg: number, azDeg: number, elDeg: number, hKm: number): Float64Array {
  const s = geodeticToEcefKm(latDeg, lonDeg, 0);
  const p = latDeg * DEG; const l = lonDeg * DEG;
  const e = Math.sin(azDeg * DEG) * Math.cos(elDeg * DEG);
  const n = Math.cos(azDeg * DEG) * Math.cos(elDeg * DEG);
  const u = Math.sin(elDeg * DEG);
  const dir = [
    -Math.sin(l) * e - Math.sin(p) * Math.cos(l) * n + Math.cos(p) * Math.cos(l) * u,
    Math.cos(l) * e - Math.sin(p) * Math.sin(l) * n + Math.cos(p) * Math.sin(l) * u,
    Math.cos(p) * n + Math.sin(p) * u,
  ];
  let lo = 0; let hi = 5000;
  const q = new Float64Array(3);
  for (let i = 0; i < 80; i++) {
    const d = (lo + hi) / 2;
    for (let k = 0; k < 3; k++) q[k] = s[k] + d * dir[k];
    if (ecefToGeodetic(q[0], q[1], q[2]).heightKm < hKm) lo = d; else hi = d;
  }
  return q;
}

const cases = [
  { lat: 68.4, lon: 17.25, az: 180 }, { lat: 0.45, lon: 36.95, az: 90 }, { lat: 42.14, lon: -3.12, az: 0 },
];
const elevations = [5, 10, 20, 45, 70];

describe('spherical-Earth geometry of Wertz & Larson (SMAD)', () => {
  for (const c of cases) {
    it(`slant range and off-nadir at 500 km for the station at ${c.lat} deg, azimuth ${c.az}`, () => {
      const geo = createStationGeometry({ name: 's', latitudeDeg: c.lat, longitudeDeg: c.lon, heightM: 0, mask: { kind: 'constant', elevationDeg: 0 } });
      const out = createGeometrySample();
      const sinp = Math.sin(c.lat * DEG);
      const N = WGS84_A_KM / Math.sqrt(1 - WGS84_E2 * sinp * sinp);
      const M = (WGS84_A_KM * (1 - WGS84_E2)) / (1 - WGS84_E2 * sinp * sinp) ** 1.5;
      const worst = { d: 0, eta: 0 };
      for (const el of elevations) {
        const t = 1.8e9;
        geo.sample(fixedEcef(pointAt(c.lat, c.lon, c.az, el, 500), t), t, out);
        expect(out.elevationDeg).toBeCloseTo(el, 9);
        expect(out.altitudeKm).toBeCloseTo(500, 6);
        const a = smad(M, 500, el); const b = smad(N, 500, el);
        const dLo = Math.min(a.d, b.d) * 0.998; const dHi = Math.max(a.d, b.d) * 1.002;
        expect(out.rangeKm).toBeGreaterThanOrEqual(dLo);
        expect(out.rangeKm).toBeLessThanOrEqual(dHi);
        // Our nadir is geocentric; on the ellipsoid it leans from the local vertical by
        // (geodetic − geocentric latitude) of the sub-satellite point, up to 0.19 deg.
        const phiSub = out.subLatitudeDeg * DEG;
        const lean = Math.abs(phiSub - Math.atan((1 - WGS84_E2) * Math.tan(phiSub))) / DEG;
        expect(out.offNadirDeg).toBeGreaterThanOrEqual(Math.min(a.eta, b.eta) - lean - 0.02);
        expect(out.offNadirDeg).toBeLessThanOrEqual(Math.max(a.eta, b.eta) + lean + 0.02);
        worst.d = Math.max(worst.d, Math.abs(out.rangeKm - smad(Math.sqrt(M * N), 500, el).d));
        worst.eta = Math.max(worst.eta, Math.abs(out.offNadirDeg - smad(Math.sqrt(M * N), 500, el).eta));
      }
      console.log(`SMAD vs WGS-84 at ${c.lat} deg: max |d - d_sphere(sqrt(MN))| = ${worst.d.toFixed(3)} km, max |eta diff| = ${worst.eta.toFixed(4)} deg`);
    });
  }
  it('a spherical check value: R = 6378.137 km, h = 500 km, 10 deg gives d = 1695.1 km, eta = 65.95 deg (computed from the SMAD relations)', () => {
    const r = smad(6378.137, 500, 10);
    expect(r.d).toBeCloseTo(1695.1, 0);
    expect(r.eta).toBeCloseTo(65.954, 2);
  });
});
