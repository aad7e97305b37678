/**
 * The scenario file schema (zod 4). Validation only: no transforms and no
 * zod defaults, so every default is applied (and recorded) by the resolver.
 * Key names are snake_case with the unit in the name. Objects are strict:
 * an unknown key is rejected with the list of allowed keys.
 */
import { z } from 'zod';

/** Strict object whose unknown-key error lists the allowed keys. */
function obj<T extends z.core.$ZodLooseShape>(shape: T) {
  const allowed = Object.keys(shape).join(', ');
  return z.strictObject(shape, {
    error: (iss) =>
      iss.code === 'unrecognized_keys'
        ? `unknown key${iss.keys.length > 1 ? 's' : ''} ${iss.keys.map((k) => JSON.stringify(k)).join(', ')} (allowed: ${allowed})`
        : undefined,
  });
}

const d = (description: string) => ({ description });

/** Scenario names become folder names (out/<name>), so they stay plain. */
const FOLDER_NAME_RE = /^[A-Za-z0-9][A-Za-z0-9 _.+-]*$/;
const folderName = (what: string) =>
  z.string().regex(FOLDER_NAME_RE, { error: `must be a name of letters, digits, space, _ . + - starting with a letter or digit` }).meta(d(`${what} name`));
/** Satellite, station, link and terminal names are free text (any script), shown escaped in every output. */
const NAME_RE = /^[^\s\p{Cc}](?:[^\p{Cc}]{0,78}[^\s\p{Cc}])?$/u;
const name = (what: string) =>
  z.string().regex(NAME_RE, { error: 'must be 1 to 80 characters with no control characters and no leading or trailing space' }).meta(d(`${what} name`));

const num = () => z.number();
const nonNeg = () => z.number().min(0);
const pos = () => z.number().positive();
const db = (what: string) => num().meta(d(`${what} (dB)`));

// ---------------------------------------------------------------- antennas

export const antennaSchema = z
  .discriminatedUnion('type', [
    obj({
      type: z.literal('isotropic'),
      gain_dbi: num().min(-40).max(20).optional().meta(d('Gain in every direction (dBi); default 0')),
    }).meta({ title: 'Isotropic antenna' }),
    obj({
      type: z.literal('parabolic'),
      diameter_m: pos().max(100).meta(d('Reflector diameter (m)')),
      efficiency: pos().max(1).optional().meta(d('Aperture efficiency η in (0, 1]; G = η (π D / λ)²; default 0.55')),
    }).meta({ title: 'Parabolic dish', description: 'G = η (π D / λ)², half-power beamwidth ≈ 70 λ / D degrees' }),
    obj({
      type: z.literal('cosine-power'),
      gain_dbi: num().min(-20).max(40).meta(d('Peak (boresight) gain (dBi)')),
      beamwidth_deg: pos().max(180).meta(d('Full half-power beamwidth (deg)')),
      floor_gain_dbi: num().min(-60).max(20).optional().meta(d('Gain floor for off-boresight angles ≥ 90° (dBi)')),
    }).meta({ title: 'Broad-beam antenna', description: 'G(θ) = G0 + 10 log10(cosⁿ θ), n from the half-power beamwidth (patch, turnstile, quadrifilar, monopole)' }),
    obj({
      type: z.literal('table'),
      pattern: z
        .array(z.tuple([num().min(0).max(180), num().min(-80).max(80)]))
        .min(2)
        .meta(d('Pairs [off_boresight_deg, gain_dbi], off-boresight angle strictly increasing from 0; linear in dB between points')),
    }).meta({ title: 'Tabulated antenna pattern' }),
  ])
  .meta({ title: 'Antenna', description: 'type: isotropic | parabolic | cosine-power | table' });

export const POLARISATION_TYPES = ['rhcp', 'lhcp', 'linear'] as const;
export const polarisationSchema = z
  .union([
    z.enum(POLARISATION_TYPES),
    obj({
      type: z.enum(POLARISATION_TYPES),
      axial_ratio_db: nonNeg().max(60).optional().meta(d('Axial ratio of an elliptical (nominally circular) antenna (dB); 0 = perfect circular; ignored for linear')),
      tilt_deg: num().min(-180).max(180).optional().meta(d('Tilt of the polarisation major axis (deg); default 0')),
    }),
  ])
  .meta({ title: 'Polarisation', description: 'rhcp, lhcp, linear, or {type, axial_ratio_db, tilt_deg}' });

// ---------------------------------------------------------------- radio ends

export const NOISE_ENVIRONMENTS = ['none', 'city', 'residential', 'rural', 'quiet-rural'] as const;

export const receiverSchema = obj({
  noise_figure_db: nonNeg().max(30).optional().meta(d('Receiver (LNA) noise figure (dB); give this or noise_temperature_k')),
  noise_temperature_k: nonNeg().max(100_000).optional().meta(d('Receiver (LNA) noise temperature (K); give this or noise_figure_db')),
  feed_loss_db: nonNeg().max(20).optional().meta(d('Loss between antenna and LNA at 290 K (dB); default 0')),
  spillover_k: nonNeg().max(1000).optional().meta(d('Ground spill-over noise added to the antenna temperature (K); default 0')),
  noise_environment: z.enum(NOISE_ENVIRONMENTS).optional().meta(d('External man-made noise environment, ITU-R P.372 (matters at VHF/UHF); default rural')),
  antenna_temperature_k: nonNeg().max(100_000).optional().meta(d('Antenna noise temperature override (K); default: sky model (downlink) or 290 K Earth (uplink)')),
}).meta({ title: 'Receiver' });

export const transmitterSchema = obj({
  power_w: pos().max(1e6).optional().meta(d('Transmitter output power (W); give this or power_dbw')),
  power_dbw: num().min(-60).max(60).optional().meta(d('Transmitter output power (dBW); give this or power_w')),
  line_loss_db: nonNeg().max(20).optional().meta(d('Line loss between power amplifier and antenna (dB); default 0')),
}).meta({ title: 'Transmitter' });

const vec3 = z.tuple([num(), num(), num()]);

export const groundPointingSchema = z
  .discriminatedUnion('mode', [
    obj({
      mode: z.literal('track'),
      pointing_error_deg: nonNeg().max(90).optional().meta(d('RMS program-track pointing error (deg); default 0')),
      max_azimuth_rate_deg_s: pos().optional().meta(d('Mount azimuth rate limit (deg/s); default unlimited')),
      max_elevation_rate_deg_s: pos().optional().meta(d('Mount elevation rate limit (deg/s); default unlimited')),
    }).meta({ title: 'Program track' }),
    obj({
      mode: z.literal('fixed'),
      azimuth_deg: num().min(0).max(360).meta(d('Fixed azimuth (deg from north, east positive)')),
      elevation_deg: num().min(-5).max(90).meta(d('Fixed elevation (deg)')),
    }).meta({ title: 'Fixed pointing' }),
  ])
  .meta({ title: 'Ground antenna pointing', description: 'mode: track | fixed' });

export const terminalSchema = obj({
  antenna: antennaSchema,
  polarisation: polarisationSchema,
  receiver: receiverSchema.optional(),
  transmitter: transmitterSchema.optional(),
  pointing: groundPointingSchema.optional(),
}).meta({ title: 'Ground terminal', description: 'An antenna with its receive and/or transmit chain' });

export const spacecraftPointingSchema = z
  .discriminatedUnion('mode', [
    obj({
      mode: z.literal('nadir'),
      boresight_body: vec3.optional().meta(d('Antenna boresight in the body frame (+Z nadir, +X velocity); default [0, 0, 1]')),
    }),
    obj({ mode: z.literal('tracking') }),
    obj({ mode: z.literal('inertial'), boresight_teme: vec3.meta(d('Boresight fixed in inertial space (TEME unit vector)')) }),
  ])
  .meta({ title: 'Spacecraft antenna pointing', description: 'mode: nadir | tracking | inertial' });

export const spacecraftSchema = obj({
  antenna: antennaSchema,
  polarisation: polarisationSchema,
  pointing: spacecraftPointingSchema,
  attitude_error_deg: nonNeg().max(180).optional().meta(d('Attitude (pointing) error of the spacecraft antenna (deg); default 0')),
  transmitter: transmitterSchema.optional(),
  receiver: receiverSchema.optional(),
}).meta({ title: 'Spacecraft side of a link' });

// ---------------------------------------------------------------- modulation and coding

export const MODULATIONS = ['bpsk', 'qpsk', 'dbpsk', 'bfsk-coherent', 'bfsk-noncoherent'] as const;

export const adaptiveModeSchema = obj({
  name: z.string().min(1).meta(d('Mode name')),
  required_es_n0_db: num().min(-20).max(40).meta(d('Required Es/N0 (dB)')),
  efficiency_bits_per_symbol: pos().max(20).meta(d('Information bits per symbol')),
});

export const modcodSchema = z
  .discriminatedUnion('type', [
    obj({
      type: z.literal('fixed'),
      bit_rate_bps: pos().max(1e11).meta(d('Information bit rate (b/s)')),
      modulation: z.enum(MODULATIONS).meta(d('Modulation')),
      coding: z.string().min(1).optional().meta(d('Coding profile name (uncoded, or a profile of the models); default uncoded')),
      ber: z.number().min(1e-15).max(0.4).optional().meta(d('Target bit error rate in [1e-15, 0.4]; default 1e-5')),
      required_eb_n0_db: num().min(-5).max(40).optional().meta(d('Explicit required Eb/N0 (dB), overriding modulation/coding/ber')),
    }).meta({ title: 'Fixed rate' }),
    obj({
      type: z.literal('adaptive'),
      symbol_rate_baud: pos().max(1e11).meta(d('Symbol rate (baud)')),
      modes: z
        .union([z.literal('dvb-s2'), z.array(adaptiveModeSchema).min(1)])
        .meta(d('"dvb-s2" (ETSI EN 302 307-1 MODCODs) or a list of modes')),
    }).meta({ title: 'Adaptive coding and modulation' }),
  ])
  .meta({ title: 'Modulation and coding', description: 'type: fixed | adaptive' });

export const linkSchema = obj({
  name: name('Link'),
  direction: z.enum(['downlink', 'uplink']).meta(d('downlink (spacecraft to ground) or uplink')),
  frequency_mhz: pos().optional().meta(d('Carrier frequency (MHz); give this or frequency_ghz')),
  frequency_ghz: pos().optional().meta(d('Carrier frequency (GHz); give this or frequency_mhz')),
  terminal: name('Ground terminal').meta(d('Name of the ground terminal used at each station')),
  stations: z.array(name('Station')).min(1).optional().meta(d('Stations used; default every station that has the terminal')),
  spacecraft: spacecraftSchema,
  modcod: modcodSchema,
  implementation_loss_db: nonNeg().max(20).optional().meta(d('Modem implementation loss (dB); default 0')),
  other_losses_db: nonNeg().max(50).optional().meta(d('Other losses, e.g. radome, interference allowance (dB); default 0')),
  required_margin_db: num().min(-20).max(50).optional().meta(d('Required link margin (dB); default 3')),
}).meta({ title: 'Link' });

// ---------------------------------------------------------------- satellites and stations

/** Rough figures from memory (PHYSICS.md §13): SGP4 near 1 km at epoch, along-track growth 1–3 km/day in LEO, cross-track far slower. */
export const ELEMENT_ERROR_DEFAULTS = { at_epoch_km: 1, along_track_km_per_day: 2, cross_track_km_per_day: 0.2 } as const;

export const elementErrorSchema = obj({
  at_epoch_km: nonNeg().max(1000).optional().meta(d(`Position error at the element epoch, in each of the along- and cross-track directions (km); default ${ELEMENT_ERROR_DEFAULTS.at_epoch_km} (from memory, rough)`)),
  along_track_km_per_day: nonNeg().max(1000).optional().meta(d(`Growth of the along-track error per day from epoch (km/day); default ${ELEMENT_ERROR_DEFAULTS.along_track_km_per_day} (from memory, rough: 1–3 km/day in LEO, more at low altitude and solar maximum)`)),
  cross_track_km_per_day: nonNeg().max(1000).optional().meta(d(`Growth of the cross-track error per day (km/day); default ${ELEMENT_ERROR_DEFAULTS.cross_track_km_per_day} (from memory, rough)`)),
}).meta({ title: 'Element-set error', description: 'Linear growth of the SGP4 error with the age of the elements: the pointing error of program-track antennas and the AOS/LOS uncertainty. All zero: perfect elements' });

// ---------------------------------------------------------------- contact planning (passbudget plan)

export const planAntennaSchema = obj({
  name: name('Antenna'),
  terminals: z.array(name('Terminal')).min(1).meta(d('Terminals of the station this antenna carries (served together, one satellite at a time)')),
  setup_s: nonNeg().max(3600).optional().meta(d('Time needed between two contacts (slew and reconfiguration) (s); default a fixed 30 s allowance plus the worst slew of the mount at its rate limits')),
}).meta({ title: 'Station antenna' });

export const bookingSchema = obj({
  price_per_minute: nonNeg().optional().meta(d('Price of one booked minute, in any currency unit (the plan cost is in the same unit); default 0')),
  minimum_booking_s: nonNeg().max(86_400).optional().meta(d('Shortest booking (s); a shorter contact is paid as this long; default 0')),
  booking_granularity_s: pos().max(3600).optional().meta(d('Bookings start and end on this grid from the window start, and are paid in whole multiples of it (s); default none')),
  max_contacts_per_day: z.number().int().min(0).optional().meta(d('Most contacts per UTC day at this station; default unlimited')),
}).meta({ title: 'Booking terms', description: 'Terms of a rented station, for passbudget plan' });

export const satellitePlanSchema = obj({
  weight: pos().max(1e6).optional().meta(d('Weight of this satellite\'s volume in the max-volume objective; default 1')),
  daily_volume_target_bits: z.union([nonNeg(), z.record(name('Link'), nonNeg())]).optional()
    .meta(d('Volume wanted per UTC day (bits): one number for all links together, or per link name')),
  min_contacts_per_day: z.number().int().min(0).max(100).optional().meta(d('Fewest contacts wanted per UTC day; default 0')),
}).meta({ title: 'Satellite demand', description: 'What the plan should give this satellite' });

export const PLAN_OBJECTIVES = ['max-volume', 'min-cost'] as const;

export const planSchema = obj({
  objective: z.enum(PLAN_OBJECTIVES).optional().meta(d('max-volume: most weighted volume (targets first); min-cost: meet every target at least cost; default max-volume')),
  weather: z.union([z.literal('clear'), z.number()]).optional().meta(d('Weather case to plan for (one of weather:); default the first')),
  horizon_days: z.number().int().min(1).max(31).optional().meta(d('Days optimised together; the window is planned horizon by horizon, each after the one before (rolling); default 1')),
  time_limit_s: pos().max(3600).optional().meta(d('Solver time limit per horizon (s); past it the better of the solver\'s best and a greedy plan is kept and the gap reported; default 20')),
}).meta({ title: 'Contact plan options' });

export const satelliteSchema = obj({
  name: name('Satellite'),
  elements: z.string().min(1).meta(d('Element file (TLE/3LE, OMM JSON or OMM XML), relative to the scenario file')),
  select: z.string().min(1).optional().meta(d('Object name or catalogue number to pick when the file holds several element sets')),
  links: z.array(linkSchema).min(1),
  element_error: elementErrorSchema.optional(),

  plan: satellitePlanSchema.optional(),
}).meta({ title: 'Satellite' });

/** Rain-climate zone letters of ITU-R P.837-1 (no I or O). */
export const RAIN_ZONES = ['A', 'B', 'C', 'D', 'E', 'F', 'G', 'H', 'J', 'K', 'L', 'M', 'N', 'P', 'Q'] as const;

export const climateSchema = obj({
  rain_rate_001_mm_h: nonNeg().max(300).optional().meta(d('Rain rate exceeded 0.01 % of an average year, R0.01 (mm/h); give this or rain_zone')),
  rain_zone: z.enum(RAIN_ZONES).optional().meta(d('ITU-R P.837-1 rain-climate zone letter, used for R0.01 when rain_rate_001_mm_h is absent')),
  isotherm_height_km: num().min(0).max(8).optional().meta(d('Mean annual 0 °C isotherm height above sea level (km); rain height = this + 0.36 km (P.839)')),
  rain_height_km: num().min(0).max(9).optional().meta(d('Rain height above sea level (km), overriding isotherm_height_km')),
  pressure_hpa: pos().max(1100).optional().meta(d('Total surface pressure (hPa); the dry-air part is used by P.676')),
  pressure_dry_hpa: pos().max(1100).optional().meta(d('Dry-air surface pressure (hPa)')),
  temperature_c: num().min(-40).max(50).optional().meta(d('Surface temperature (°C), within the ITU-R P.453 range −40 to 50 °C')),
  temperature_k: num().min(233.15).max(323.15).optional().meta(d('Surface temperature (K), within the ITU-R P.453 range 233.15 to 323.15 K')),
  water_vapour_density_g_m3: nonNeg().max(50).optional().meta(d('Surface water-vapour density (g/m³)')),
  // P.676-12 Annex 2 takes T_ref = 14 ln(0.22 V_t / 2.38) + 3 °C: below 0.1 kg/m² it falls under -60 °C, and at 1e-8 below 0 K (NaN).
  water_vapour_content_kg_m2: z.number().min(0.1).max(100).optional().meta(d('Integrated water-vapour content V_t (kg/m²), 0.1 to 100 (the driest air holds about 1), preferred by P.676 Annex 2 when known')),
  relative_humidity_pct: nonNeg().max(100).optional().meta(d('Surface relative humidity (%)')),
  n_wet: nonNeg().max(300).optional().meta(d('Wet term of the surface refractivity, N_wet (N-units, P.453)')),
  cloud_liquid_water_kg_m2: nonNeg().max(10).optional().meta(d('Columnar cloud liquid water for the exceedance cases (kg/m², P.840)')),
  clear_sky_cloud_liquid_water_kg_m2: nonNeg().max(10).optional().meta(d('Columnar cloud liquid water for the clear-sky case (kg/m²); default 0')),
  mean_radiating_temperature_k: num().min(200).max(320).optional().meta(d('Mean radiating temperature for sky noise (K)')),
}).meta({ title: 'Station climate' });

export const stationSchema = obj({
  name: name('Station'),
  latitude_deg: num().min(-90).max(90).meta(d('Geodetic latitude (deg, north positive)')),
  longitude_deg: num().min(-180).max(360).meta(d('Longitude (deg, east positive)')),
  height_m: num().min(-500).max(9000).meta(d('Height above the WGS-84 ellipsoid (m)')),
  mask_deg: num().min(-5).max(90).optional().meta(d('Constant horizon mask elevation (deg); give this or mask_table')),
  mask_table: z
    .array(z.tuple([num().min(0).lt(360), num().min(-5).max(90)]))
    .min(1)
    .optional()
    .meta(d('Horizon mask as [azimuth_deg, elevation_deg] pairs, azimuth strictly increasing in [0, 360); linear, wrapping at 360°')),
  mask_on: z.enum(['geometric', 'apparent']).optional().meta(d('Apply the mask to geometric or apparent (refracted, P.834) elevation; default geometric')),
  priority: z.number().int().min(1).optional().meta(d('Priority for the priority network policy (1 = highest); default the order in the file')),
  climate: climateSchema,
  terminals: z.record(name('Terminal'), terminalSchema).meta(d('Ground terminals by name')),
  antennas: z.array(planAntennaSchema).min(1).optional()
    .meta(d('Antennas for contact planning (passbudget plan): each carries some of the terminals and serves one satellite at a time; default each terminal its own antenna')),
  booking: bookingSchema.optional(),
}).meta({ title: 'Ground station' });

// ---------------------------------------------------------------- run options

/** Shortest time step (s): the event search resolves AOS/LOS to 5 ms, a finer grid adds nothing but time. */
export const MIN_STEP_S = 0.01;

export const windowSchema = obj({
  start: z.string().min(1).meta(d('Start (ISO-8601; UTC when no offset)')),
  end: z.string().min(1).optional().meta(d('End (ISO-8601); give this or duration')),
  duration: z.union([z.string().min(1), pos()]).optional().meta(d('Duration like 90s, 45m, 36h, 7d, 2w, or seconds; give this or end')),
  step_s: z.number().min(MIN_STEP_S).max(3600).optional().meta(d(`Time step inside passes (s), ${MIN_STEP_S} to 3600; default 1`)),
}).meta({ title: 'Analysis window' });

export const weatherSchema = z
  .array(z.union([z.literal('clear'), z.number().min(0.001).max(5)]))
  .min(1)
  .meta(d('Weather cases: "clear" and/or annual exceedance percentages p in [0.001, 5] (P.618); default [clear]'));

export const networkSchema = obj({
  policy: z.enum(['highest-rate', 'priority', 'best-margin'])
    .meta(d('Which station a satellite uses when several see it: highest-rate (the station delivering the highest information rate, then the best margin; default) or priority (the first in order that closes). best-margin is the old name of highest-rate, accepted with a deprecation warning')),
  order: z.array(name('Station')).min(1).optional().meta(d('Station order for the priority policy (first = highest); default the station priorities')),
}).meta({ title: 'Network policy' });

export const maskFinderSchema = obj({
  fraction: z.number().gt(0).max(1).meta(d('Fraction of in-view steps that must meet the required margin, in (0, 1]; default 1')),
}).meta({ title: 'Elevation-mask finder' });

export const rateFinderSchema = obj({
  bit_rates_bps: z.array(pos()).min(1).optional().meta(d('Bit rates to try (b/s)')),
  range: obj({
    from_bps: pos().meta(d('Lowest bit rate (b/s)')),
    to_bps: pos().meta(d('Highest bit rate (b/s)')),
    per_decade: z.number().int().min(1).max(100).optional().meta(d('Logarithmically spaced rates per decade; default 10')),
  }).optional().meta(d('A logarithmic range of bit rates, instead of bit_rates_bps')),
}).meta({ title: 'Data-rate finder' });

export const outputSchema = obj({
  dir: z.string().min(1).optional().meta(d('Output directory, relative to the scenario file')),
  steps: z.union([z.enum(['csv', 'parquet', 'none']), z.boolean()]).optional().meta(d('The per-step table: csv (steps.csv), parquet (steps.parquet) or none; true means csv, false none; default none')),
}).meta({ title: 'Output options' });

export const sunSchema = obj({
  noise: z.boolean().optional().meta(d('Add the Sun\'s noise when it is in a tracking ground antenna\'s beam on a downlink; default true')),
  activity_factor: z.number().min(1).max(1000).optional().meta(d('Brightness of the Sun relative to the quiet Sun (1 = quiet; an active Sun is several times brighter at microwave frequencies); default 1')),
}).meta({ title: 'Sun in the beam' });

export const scenarioSchema = obj({
  name: folderName('Scenario'),
  description: z.string().optional().meta(d('Free text')),
  window: windowSchema,
  weather: weatherSchema.optional(),
  satellites: z.array(satelliteSchema).min(1),
  stations: z.array(stationSchema).min(1),
  network: networkSchema.optional(),
  mask_finder: maskFinderSchema.optional(),
  rate_finder: rateFinderSchema.optional(),
  output: outputSchema.optional(),
  sun: sunSchema.optional(),
  exact_orbit: z.boolean().optional().meta(d('SGP4 at every instant instead of interpolating between SGP4 nodes about a minute apart (slower; a check of the interpolation); default false')),
  plan: planSchema.optional().meta(d('Contact planning options (passbudget plan)')),
}).meta({
  title: 'passbudget scenario',
  description: 'Satellites, stations, links, window and weather for a pass-by-pass link budget run (YAML or JSON)',
});

export type ScenarioInput = z.infer<typeof scenarioSchema>;
export type StationInput = z.infer<typeof stationSchema>;
export type ClimateInput = z.infer<typeof climateSchema>;
export type TerminalInput = z.infer<typeof terminalSchema>;
export type LinkInput = z.infer<typeof linkSchema>;
export type AntennaInput = z.infer<typeof antennaSchema>;
export type PolarisationInput = z.infer<typeof polarisationSchema>;
export type ReceiverInput = z.infer<typeof receiverSchema>;
export type TransmitterInput = z.infer<typeof transmitterSchema>;

/** JSON Schema (2020-12) of the scenario file, generated from the zod schema. */
export function scenarioJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(scenarioSchema, { target: 'draft-2020-12', io: 'input' }) as Record<string, unknown>;
}
