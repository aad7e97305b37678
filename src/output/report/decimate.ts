/** Thin a pass series to at most `maxPoints` samples by even striding, keeping the first and last sample. */
import type { PassSeries } from './types.js';

export function decimateSeries(s: PassSeries, maxPoints = 300): PassSeries {
  const n = s.timeS.length;
  if (n <= maxPoints || maxPoints < 2) return s;
  const keep: number[] = [];
  for (let i = 0; i < maxPoints; i++) keep.push(Math.round((i * (n - 1)) / (maxPoints - 1)));
  const pick = (a: number[]) => keep.map((k) => a[k]);
  return {
    passId: s.passId, link: s.link,
    timeS: pick(s.timeS), azimuthDeg: pick(s.azimuthDeg), elevationDeg: pick(s.elevationDeg),
    cases: s.cases.map((c) => ({ weather: c.weather, marginDB: pick(c.marginDB), ebN0DB: pick(c.ebN0DB) })),
  };
}
