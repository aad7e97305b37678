import type { ElementSet } from '../elements/types.js';
import type { Station } from '../geometry/types.js';
import type { Climate, ElementErrorSpec, LinkSpec, SunNoiseSpec, WeatherCase } from '../budget/types.js';

/** A default the loader applied, listed in every run's outputs. */
export interface AppliedDefault {
  /** Scenario path, e.g. `stations[1].climate.rain_height_km`. */
  path: string;
  value: string;
  /** Why / where the value comes from (model name, "(from memory)" where so). */
  reason: string;
}

export interface ScenarioSatellite {
  name: string; elements: ElementSet; elementsFile: string;
  /** The element set's error growth (epoch from the elements). Absent in hand-built scenarios: no element error. */
  elementError?: ElementErrorSpec;
}

export interface ScenarioStation {
  station: Station;
  climate: Climate;
  /** Priority for the fixed-priority network policy (1 = highest). */
  priority: number;
}

export type NetworkPolicy = { kind: 'highest-rate' } | { kind: 'priority'; order: string[] };

/** The scenario with every reference and unit resolved: what the run, mask and rate commands consume. */
export interface ResolvedScenario {
  name: string;
  /** Absolute path of the scenario file, and the raw bytes' SHA-256 together with element files'. */
  file: string;
  inputsSha256: string;
  window: { startS: number; endS: number; stepS: number };
  satellites: ScenarioSatellite[];
  stations: ScenarioStation[];
  /** One resolved link per (satellite, station, link name). */
  links: LinkSpec[];
  weatherCases: WeatherCase[];
  network: NetworkPolicy;
  /** Mask finder: fraction of steps that must meet the margin (1 = all). */
  maskFraction: number;
  /** Rate finder: bit rates to try (b/s) per fixed-rate link name. */
  rateCandidatesBps: number[];
  /** The per-step table: its format, or none. */
  output: { dir: string | null; steps: StepsChoice };
  /** SGP4 at every instant instead of interpolating between nodes (orbit/interpolated.ts). */
  exactOrbit: boolean;
  /** Noise from the Sun in the ground antennas' beams; absent (hand-built scenarios) or null: not modelled. */
  sun?: SunNoiseSpec | null;
  /** Contact-planning terms (passbudget plan); always set by the loader. */
  plan?: ResolvedPlan;
  /** Set by the plan job: keep each pass-link's cumulative volume on this grid (s) (sweep/profiles.ts). */
  volumeProfileGridS?: number;
  defaultsApplied: AppliedDefault[];
  warnings: string[];
  /**
   * The warnings a person must see before a run starts (a deprecated name, a
   * window far from the element epoch): the CLI prints them on stderr, even
   * with --quiet. Each is also in `warnings` (and so in summary.json).
   */
  notices?: string[];
}

/** `output.steps`: steps.csv, steps.parquet or no per-step file. */
export type StepsChoice = 'csv' | 'parquet' | 'none';
export const STEPS_CHOICES: readonly StepsChoice[] = ['csv', 'parquet', 'none'];
/** A steps option as the scenario or the library may give it: a format, or a boolean (true = csv, false = none). */
export function stepsChoice(v: boolean | StepsChoice): StepsChoice {
  return v === true ? 'csv' : v === false ? 'none' : v;
}

/** One antenna of a station: it carries some terminals and serves one satellite at a time on all of them. */
export interface PlanAntenna { station: string; name: string; terminals: string[]; setupS: number }

export interface StationBooking {
  /** Price of a booked minute (any currency unit). */
  pricePerMinute: number;
  minimumBookingS: number;
  /** Booking grid from the window start (s), or none. */
  granularityS: number | null;
  maxContactsPerDay: number | null;
}

export interface SatelliteDemand {
  satellite: string;
  weight: number;
  /** Bits per UTC day: all links together, or per link name; null: none. */
  dailyTargetBits: null | { total: number } | { byLink: Record<string, number> };
  minContactsPerDay: number;
  /** Ground terminal of each link, by link name. */
  linkTerminals: Record<string, string>;
}

/** The contact-planning terms of a scenario (passbudget plan). */
export interface ResolvedPlan {
  objective: 'max-volume' | 'min-cost';
  /** Weather case name planned for. */
  weather: string;
  horizonDays: number;
  timeLimitS: number;
  antennas: PlanAntenna[];
  booking: Record<string, StationBooking>;
  demand: SatelliteDemand[];
  /** The plan's own defaults (apart from the run's, which they do not change). */
  defaultsApplied: AppliedDefault[];
}
