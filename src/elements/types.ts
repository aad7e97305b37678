/** One validated orbit element set, from a TLE/3LE or a CCSDS OMM. */
export interface ElementSet {
  /** Object name (3LE line 0 or OMM OBJECT_NAME); the catalogue number when absent. */
  name: string;
  /** Catalogue number as written (alpha-5 allowed, e.g. "A1234"); numeric value in `catalogNumberValue`. */
  catalogNumber: string;
  catalogNumberValue: number;
  internationalDesignator: string;
  /** Epoch as Unix seconds UTC (float). */
  epochUnixS: number;
  meanMotionRevPerDay: number;
  eccentricity: number;
  inclinationDeg: number;
  raanDeg: number;
  argOfPerigeeDeg: number;
  meanAnomalyDeg: number;
  bstarPerEarthRadius: number;
  meanMotionDotRevPerDay2: number;
  meanMotionDdotRevPerDay3: number;
  elementSetNumber: number;
  revolutionNumber: number;
  /** Where it came from, for messages: file and first line (1-based). */
  source: { file: string; line: number; format: 'tle' | 'omm-json' | 'omm-xml' };
  /** The two TLE lines when the source was a TLE (used to build the satrec). */
  tleLines?: [string, string];
}
