/**
 * The resolved link description the budget engine consumes: one object per
 * (satellite, station, link), all units resolved, all defaults applied.
 * The scenario stage produces it; tests build it directly.
 */

export type Direction = 'downlink' | 'uplink';

export type AntennaSpec =
  | { kind: 'isotropic'; gainDBi?: number }
  /** Parabolic dish: G = η (π D / λ)², θ3dB ≈ 70 λ / D. */
  | { kind: 'parabolic'; diameterM: number; efficiency: number }
  /** Broad beam: G(θ) = G0 + 10 log10(cosⁿ θ), n from the half-power beamwidth; floor for θ ≥ 90°. */
  | { kind: 'cosine-power'; peakGainDBi: number; beamwidthDeg: number; floorGainDBi?: number }
  /** Tabulated gain against off-boresight angle, linear in dB between points. */
  | { kind: 'table'; offBoresightDeg: number[]; gainDBi: number[] };

/** Signed voltage axial ratio: +1 RHCP, −1 LHCP, ±Infinity linear; tilt of the major axis in degrees. */
export interface PolarisationSpec { axialRatio: number; tiltDeg: number }

/** How the spacecraft antenna is pointed. Body frame for nadir: +Z to nadir, +X toward the velocity, +Y completes. */
export type SpacecraftPointing =
  | { kind: 'nadir'; boresightBody: [number, number, number]; attitudeErrorDeg: number }
  | { kind: 'tracking'; attitudeErrorDeg: number }
  /** Boresight fixed in inertial space, given in TEME. */
  | { kind: 'inertial'; boresightTeme: [number, number, number]; attitudeErrorDeg: number };

/** How the ground antenna is pointed, with optional mount rate limits (deg/s). */
export type GroundPointing =
  | { kind: 'track'; pointingErrorDeg: number; maxAzimuthRateDegS?: number; maxElevationRateDegS?: number }
  | { kind: 'fixed'; azimuthDeg: number; elevationDeg: number };

export type NoiseEnvironment = 'none' | 'city' | 'residential' | 'rural' | 'quiet-rural';

export interface ReceiverSpec {
  /** One of noise figure or noise temperature of the LNA/receiver. */
  noiseFigureDB?: number;
  noiseTemperatureK?: number;
  /** Loss between antenna and LNA (dB), at physical temperature 290 K. */
  feedLossDB: number;
  /** Ground spill-over noise added to the antenna temperature (K). */
  spilloverK: number;
  /** External (galactic + man-made) noise environment, for VHF/UHF (P.372). */
  environment: NoiseEnvironment;
  /**
   * Antenna noise temperature override (K). When absent: downlink = sky model
   * (+ spill-over + external); uplink = 290 K Earth-filled beam (from memory, common practice).
   */
  antennaTemperatureK?: number;
}

export type Modulation = 'bpsk' | 'qpsk' | 'dbpsk' | 'bfsk-coherent' | 'bfsk-noncoherent';

/** One mode of an adaptive table (e.g. a DVB-S2 MODCOD). */
export interface AdaptiveMode {
  name: string;
  requiredEsN0DB: number;
  /** Information bits per symbol. */
  efficiencyBitsPerSymbol: number;
}

export type ModCodSpec =
  | {
      kind: 'fixed';
      bitRateBps: number;
      modulation: Modulation;
      /** Coding profile name (e.g. 'uncoded', 'conv-r1/2-k7', 'rs-conv'); informational once resolved. */
      coding: string;
      /** Required Eb/N0 at the target BER, resolved from modulation + coding + BER (or given). */
      requiredEbN0DB: number;
      /** Information bits per channel symbol (modulation bits × code rate), to give Es/N0. */
      bitsPerSymbol: number;
    }
  | { kind: 'adaptive'; symbolRateBaud: number; modes: AdaptiveMode[] };

/** One end of the link (spacecraft or ground). */
export interface LinkEnd {
  antenna: AntennaSpec;
  polarisation: PolarisationSpec;
  /** Transmitter power at the PA output (dBW); needed on the transmitting end. */
  txPowerDBW?: number;
  /** Line loss between PA/LNA and antenna on this end (dB): transmit line loss when transmitting. */
  lineLossDB: number;
  /** Receiver: needed on the receiving end. */
  receiver?: ReceiverSpec;
}

export interface LinkSpec {
  name: string;
  satellite: string;
  station: string;
  direction: Direction;
  frequencyGHz: number;
  spacecraft: LinkEnd & { pointing: SpacecraftPointing };
  ground: LinkEnd & { pointing: GroundPointing };
  modcod: ModCodSpec;
  implementationLossDB: number;
  otherLossesDB: number;
  requiredMarginDB: number;
}

/** Station climate for the atmospheric models (ITU-R P.676, P.618, P.838, P.839, P.840, P.453). */
export interface Climate {
  latitudeDeg: number;
  stationHeightKm: number;
  /** Dry-air surface pressure (hPa). */
  pressureDryHPa: number;
  temperatureK: number;
  waterVapourDensityGM3: number;
  /** Integrated water-vapour content (kg/m²), preferred for the water-vapour slant term when known. */
  waterVapourContentKgM2?: number;
  /** Wet refractivity (N-units) for scintillation (P.453). */
  nWet: number;
  rainRate001MmH: number;
  rainHeightKm: number;
  /** Columnar cloud liquid water (kg/m²) used for the exceedance cases. */
  cloudLiquidWaterKgM2: number;
  /** Cloud liquid water for the clear-sky case (kg/m²); 0 = gases only. */
  clearSkyCloudLiquidWaterKgM2: number;
  /** Mean radiating temperature for sky noise (K). */
  meanRadiatingTemperatureK: number;
}

/** A weather case: clear sky (exceedancePercent null) or an annual exceedance percentage p. */
export interface WeatherCase { name: string; exceedancePercent: number | null }

/** Weather-dependent part of the per-step budget, one per weather case. */
export interface CaseBudget {
  weather: string;
  gas_loss_db: number;
  rain_loss_db: number;
  cloud_loss_db: number;
  scintillation_db: number;
  atmospheric_loss_db: number;
  antenna_temperature_k: number;
  system_temperature_k: number;
  g_over_t_dbk: number;
  c_over_n0_dbhz: number;
  eb_over_n0_db: number;
  es_over_n0_db: number;
  required_eb_over_n0_db: number;
  margin_db: number;
  /** margin_db ≥ the link's required margin (fixed) or a mode fits (adaptive). */
  usable: boolean;
  /** Adaptive links: the mode chosen, or '' when none fits. Fixed links: ''. */
  mode: string;
  /** Information rate delivered at this step (b/s): fixed rate when usable, adaptive Rs·η, else 0. */
  information_rate_bps: number;
  /** C/N0 lost to the Sun's noise (dB, ≥ 0). */
  sun_loss_db: number;
}

/** Per-step budget record. Reused between steps by the engine; copy what you keep. */
export interface StepBudget {
  time_s: number;
  range_km: number;
  elevation_deg: number;
  azimuth_deg: number;
  tx_off_boresight_deg: number;
  rx_off_boresight_deg: number;
  eirp_dbw: number;
  free_space_loss_db: number;
  polarisation_loss_db: number;
  tx_pointing_loss_db: number;
  rx_pointing_loss_db: number;
  other_losses_db: number;
  /** Ground mount lag behind the target (deg) and whether the mount rate limit bound this step. */
  mount_lag_deg: number;
  mount_limited: boolean;
  doppler_hz: number;
  doppler_rate_hz_s: number;
  /** Probability that the step closes over an average year's weather (P.618 inverted, weather.ts). */
  closing_probability: number;
  /** Σ over rate levels of rate × the probability the level closes (Mb/s = 10^6 b/s). */
  expected_information_rate_mbps: number;
  /** The probability was clamped at the model's 0.001–5 % range. */
  closing_probability_clamped: boolean;
  /** Age of the element set at this step (days, t − epoch, or the fixed what-if age). */
  element_age_days: number;
  /** Pointing error the element error implies at the station (deg), added (root sum of squares) to a program track's. */
  element_pointing_error_deg: number;
  /** Angle between the Sun and the ground antenna's boresight (deg); NaN when not modelled. */
  sun_separation_deg: number;
  /** Antenna temperature the Sun adds (K, above the atmosphere). */
  sun_noise_temperature_k: number;
  cases: CaseBudget[];
}

/**
 * Element-set error of the satellite's elements (models/elementError.ts): the
 * elements' epoch and the linear error growth; `ageDays` fixes the age at
 * every step (a what-if: "the elements are this old") instead of t − epoch.
 */
export interface ElementErrorSpec {
  epochS: number;
  atEpochKm: number;
  alongTrackKmPerDay: number;
  crossTrackKmPerDay: number;
  ageDays?: number;
}

/** Noise from the Sun in the ground antenna's beam (models/sunNoise.ts): quiet-Sun brightness × activityFactor. */
export interface SunNoiseSpec { activityFactor: number }
