/** One pass of a satellite over a station, above the station's horizon mask. Times are Unix seconds UTC. */
export interface Pass {
  /** 1-based, in AOS order per (satellite, station) search; unique ids are assigned by the caller. */
  index: number;
  satellite: string;
  station: string;
  aosS: number;
  tcaS: number;
  losS: number;
  durationS: number;
  maxElevationDeg: number;
  aosAzimuthDeg: number;
  tcaAzimuthDeg: number;
  losAzimuthDeg: number;
  minRangeKm: number;
  /** The pass was already in progress at the window start (AOS = window start). */
  clippedStart: boolean;
  /** The pass was still in progress at the window end (LOS = window end). */
  clippedEnd: boolean;
}
