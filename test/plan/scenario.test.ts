/**
 * The planning terms of a scenario: antennas (default: each terminal its own),
 * their setup rule, booking terms, demand, and the located errors.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenario, parseScenarioText } from '../../src/scenario/index.js';
import { InputError } from '../../src/errors.js';

const FILE = path.resolve('fixtures/constellation/scenario.yaml');
const TEXT = readFileSync(FILE, 'utf8');
const parse = (text: string) => parseScenarioText(text, 'scenario.yaml', path.dirname(FILE));
const fails = (text: string) => { try { parse(text); } catch (e) { expect(e).toBeInstanceOf(InputError); return (e as Error).message; } throw new Error('no error'); };

describe('constellation demo plan terms', () => {
  const s = loadScenario(FILE);
  const plan = s.plan!;
  it('has one S/X dish per station, six satellites and the rented station\'s terms', () => {
    expect(s.satellites.map((x) => x.elements.catalogNumberValue)).toEqual([99961, 99962, 99963, 99964, 99965, 99966]);
    expect(plan.antennas.map((a) => `${a.station}/${a.name}:${a.terminals.join('+')}`)).toEqual([
      'Kaldfjell/dish:s-feed+x-feed', 'Pico Verde/dish:s-feed+x-feed', 'Maraka/dish:s-feed+x-feed', 'Cabo Lirio/dish:s-feed+x-feed']);
    expect(plan.booking['Cabo Lirio']).toEqual({ pricePerMinute: 12, minimumBookingS: 300, granularityS: 60, maxContactsPerDay: 6 });
    expect(plan.booking.Kaldfjell).toEqual({ pricePerMinute: 0, minimumBookingS: 0, granularityS: null, maxContactsPerDay: null });
  });
  it('takes the setup rule: 30 s + max(180° / 5 °/s, 90° / 3 °/s) = 66 s', () => {
    for (const a of plan.antennas) expect(a.setupS).toBe(66);
  });
  it('keeps its defaults apart from the run\'s', () => {
    expect(plan.defaultsApplied.some((d) => d.path === 'stations[0].antennas[0].setup_s')).toBe(true);
    expect(s.defaultsApplied.some((d) => d.path.includes('antennas'))).toBe(false);
  });
});

describe('default antennas', () => {
  it('are the terminals, each its own antenna, 30 s setup without rate limits', () => {
    const s = loadScenario(path.resolve('fixtures/scenarios/base.yaml'));
    const terminals = s.stations.length; // every station of base.yaml has terminals; each becomes one antenna
    expect(s.plan!.antennas.length).toBeGreaterThanOrEqual(terminals);
    for (const a of s.plan!.antennas) {
      expect(a.terminals).toEqual([a.name]);
      expect(a.setupS).toBe(30);
    }
  });
});

describe('located errors', () => {
  it('a station with no antenna', () => {
    const m = fails(TEXT.replace(`    antennas: &one-dish
      - name: dish
        terminals: [s-feed, x-feed]`, '    antennas: []').replaceAll('*one-dish', '[{ name: dish, terminals: [s-feed] }]'));
    expect(m).toMatch(/^scenario\.yaml:\d+ stations\[0\]\.antennas: must have at least 1 item \(got 0\)/);
  });
  it('an empty fleet', () => {
    const start = TEXT.indexOf('satellites:\n'), end = TEXT.indexOf('\nstations:');
    // The links anchor lives in the fleet: the empty fleet keeps none.
    const m = fails(`${TEXT.slice(0, start)}satellites: []\n${TEXT.slice(end)}`);
    expect(m).toMatch(/^scenario\.yaml:\d+ satellites: must have at least 1 item \(got 0\)/);
  });
  it('an antenna with a terminal the station lacks, or one terminal on two antennas', () => {
    expect(fails(TEXT.replace('terminals: [s-feed, x-feed]', 'terminals: [s-feed, ka-feed]'))).toMatch(/stations\[0\]\.antennas\[0\]\.terminals\[1\]: unknown terminal "ka-feed" \(allowed: s-feed, x-feed\)/);
    expect(fails(TEXT.replace(`      - name: dish
        terminals: [s-feed, x-feed]`, `      - name: dish
        terminals: [s-feed, x-feed]
      - name: second
        terminals: [x-feed]`))).toMatch(/antennas\[1\]\.terminals\[0\]: terminal "x-feed" is already on antenna "dish"/);
  });
  it('a plan weather case that is not run', () => {
    expect(fails(TEXT.replace('  weather: clear\n', '  weather: 0.1\n'))).toMatch(/plan\.weather: weather case 0\.1% is not in weather: \(allowed: clear, 1%\)/);
  });
  it('a per-link target naming an unknown link', () => {
    expect(fails(TEXT.replace('daily_volume_target_bits: 1.6e11', 'daily_volume_target_bits: { ka-band: 1.0e9 }'))).toMatch(/satellites\[0\]\.plan\.daily_volume_target_bits\.ka-band: unknown link "ka-band"/);
  });
});
