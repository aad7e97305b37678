/**
 * RFC 5545 checks on the calendar of usable windows: CRLF line ends (§3.1),
 * 75-octet folding with a leading space and never inside a UTF-8 character
 * (§3.1), TEXT escaping (§3.3.11), UTC DATE-TIME with Z (§3.3.5), DTEND after
 * DTSTART (§3.8.2.2), one unique UID per event (§3.8.4.7), BEGIN/END balance (§3.4, §3.6).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  escapeIcsText, eventUid, foldIcsLine, icsUtc, renderCalendar, unfoldIcs, usableWindowEvents, type UsableWindowEvent,
} from '../../src/output/ics.js';
import { syntheticScenario } from '../browser/synthetic.js';

const DTSTAMP = Date.UTC(2031, 4, 30, 12, 0, 0) / 1000;

/** Test-side inverse of TEXT escaping (RFC 5545 §3.3.11). */
function unescapeText(v: string): string {
  return v.replace(/\\([\\;,nN])/g, (_m, c: string) => (c === 'n' || c === 'N' ? '\n' : c));
}

function physicalLines(ics: string): string[] {
  expect(ics.endsWith('\r\n')).toBe(true);
  return ics.slice(0, -2).split('\r\n');
}

/** Logical lines after unfolding, split into name and value at the first ':'. */
function properties(ics: string): { name: string; value: string }[] {
  return unfoldIcs(ics).slice(0, -2).split('\r\n').map((l) => {
    const i = l.indexOf(':');
    return { name: l.slice(0, i), value: l.slice(i + 1) };
  });
}

function event(over: Partial<UsableWindowEvent> = {}): UsableWindowEvent {
  return {
    passId: 'ORBILUX-3/Kaldfjell/1', satellite: 'ORBILUX-3', station: 'Kaldfjell', link: 's-band', direction: 'downlink',
    weather: 'clear', startS: Date.UTC(2031, 5, 1, 2, 14, 0) / 1000, endS: Date.UTC(2031, 5, 1, 2, 20, 30) / 1000,
    aosS: Date.UTC(2031, 5, 1, 2, 12, 0) / 1000, tcaS: Date.UTC(2031, 5, 1, 2, 17, 0) / 1000, losS: Date.UTC(2031, 5, 1, 2, 22, 0) / 1000,
    maxElevationDeg: 58.04, usableDurationS: 390, volumeBits: 390e6, minMarginDB: 3.2, verdict: 'usable', ...over,
  };
}

describe('renderCalendar on the synthetic ORBILUX-3 scenario', () => {
  const input = syntheticScenario();
  const ics = renderCalendar(input.passes, { dtstampS: DTSTAMP, calendarName: 'ORBILUX-3 usable windows' });
  const props = properties(ics);

  it('ends every line with CRLF and has no bare CR or LF', () => {
    expect(ics.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
  });

  it('keeps every physical line within 75 octets; continuation lines start with one space', () => {
    const lines = physicalLines(ics);
    for (const l of lines) expect(Buffer.byteLength(l, 'utf8')).toBeLessThanOrEqual(75);
    const continuation = lines.filter((l) => l.startsWith(' '));
    expect(continuation.length).toBeGreaterThan(0); // DESCRIPTION is long enough to fold
    for (const l of lines) expect(/^[A-Z-]+[:;]/.test(l) || l.startsWith(' ')).toBe(true);
  });

  it('balances BEGIN/END and nests VEVENT inside VCALENDAR', () => {
    const stack: string[] = [];
    for (const p of props) {
      if (p.name === 'BEGIN') stack.push(p.value);
      if (p.name === 'END') expect(stack.pop()).toBe(p.value);
      if (p.name === 'BEGIN' && p.value === 'VEVENT') expect(stack).toEqual(['VCALENDAR', 'VEVENT']);
    }
    expect(stack).toEqual([]);
    expect(props[0]).toEqual({ name: 'BEGIN', value: 'VCALENDAR' });
    expect(props.find((p) => p.name === 'VERSION')?.value).toBe('2.0');
    expect(props.find((p) => p.name === 'PRODID')?.value).toBe('-//passbudget//usable contact windows//EN');
  });

  it('has one VEVENT per usable window of the first weather case, each with exactly one UID, all unique', () => {
    const expected = input.passes.filter((p) => p.cases[0].usableStartS !== null && p.cases[0].usableDurationS > 0).length;
    expect(expected).toBeGreaterThan(10);
    const text = unfoldIcs(ics);
    const blocks = text.split('BEGIN:VEVENT\r\n').slice(1).map((b) => b.slice(0, b.indexOf('END:VEVENT')));
    expect(blocks.length).toBe(expected);
    const uids = blocks.map((b) => {
      const u = b.split('\r\n').filter((l) => l.startsWith('UID:'));
      expect(u.length).toBe(1);
      return u[0];
    });
    expect(new Set(uids).size).toBe(uids.length);
  });

  it('writes DTSTART, DTEND and DTSTAMP as UTC with Z, DTEND after DTSTART, equal to the windows', () => {
    const starts = props.filter((p) => p.name === 'DTSTART').map((p) => p.value);
    const ends = props.filter((p) => p.name === 'DTEND').map((p) => p.value);
    for (const v of [...starts, ...ends, ...props.filter((p) => p.name === 'DTSTAMP').map((p) => p.value)]) expect(v).toMatch(/^\d{8}T\d{6}Z$/);
    starts.forEach((s, i) => expect(ends[i] > s).toBe(true));
    expect(props.filter((p) => p.name === 'DTSTAMP').every((p) => p.value === '20310530T120000Z')).toBe(true);
    const firstWindow = Math.min(...input.passes.filter((p) => p.cases[0].usableStartS !== null).map((p) => p.cases[0].usableStartS as number));
    expect(starts[0]).toBe(new Date(firstWindow * 1000).toISOString().replace(/[-:]/g, '').slice(0, 15) + 'Z');
  });

  it('is deterministic', () => {
    expect(renderCalendar(input.passes, { dtstampS: DTSTAMP, calendarName: 'ORBILUX-3 usable windows' })).toBe(ics);
  });

  it('selects another weather case on request and rejects an unknown one with a one-line InputError', () => {
    const p01 = renderCalendar(input.passes, { dtstampS: DTSTAMP, weather: 'p0.1' });
    const n = input.passes.filter((p) => (p.cases.find((c) => c.weather === 'p0.1')?.usableDurationS ?? 0) > 0).length;
    expect((p01.match(/BEGIN:VEVENT/g) ?? []).length).toBe(n);
    expect(p01).toContain('.p0%2E1@passbudget.invalid');
    expect(() => renderCalendar(input.passes, { dtstampS: DTSTAMP, weather: 'p5' })).toThrow(InputError);
    expect(() => renderCalendar(input.passes, { dtstampS: DTSTAMP, weather: 'p5' })).toThrow(/^calendar weather: case "p5" not in pass ORBILUX-3\/Kaldfjell\/1 \(allowed: clear, p1, p0\.1\)$/);
  });
});

describe('TEXT escaping and folding', () => {
  it('escapes backslash, semicolon, comma and newlines, and unescaping restores the text', () => {
    const raw = 'Pico, Verde; \\north\\ side\nline two\r\nthree';
    expect(escapeIcsText(raw)).toBe('Pico\\, Verde\\; \\\\north\\\\ side\\nline two\\nthree');
    expect(unescapeText(escapeIcsText(raw))).toBe(raw.replace(/\r\n/g, '\n'));
  });

  it('escapes station names inside the calendar', () => {
    const ics = renderCalendar([event({ station: 'Pico, Verde; \\ "N"\nslope' })], { dtstampS: DTSTAMP });
    const loc = properties(ics).find((p) => p.name === 'LOCATION');
    expect(loc?.value).toBe('Pico\\, Verde\\; \\\\ "N"\\nslope');
    expect(unescapeText(loc?.value ?? '')).toBe('Pico, Verde; \\ "N"\nslope');
  });

  it('folds at 75 octets without splitting multi-byte UTF-8 characters, and unfolding restores the line', () => {
    // 2-, 3- and 4-octet characters, placed so naive 75-byte cuts would land inside them.
    const line = `SUMMARY:${'é'.repeat(40)}${'水'.repeat(30)}${'🛰'.repeat(25)}Kaldfjell`;
    const folded = foldIcsLine(line);
    const parts = folded.split('\r\n');
    expect(parts.length).toBeGreaterThan(3);
    for (const [i, p] of parts.entries()) {
      expect(Buffer.byteLength(p, 'utf8')).toBeLessThanOrEqual(75);
      expect(p).not.toContain('\uFFFD');
      expect(Buffer.from(p, 'utf8').toString('utf8')).toBe(p);
      if (i > 0) expect(p.startsWith(' ')).toBe(true);
    }
    // First line takes 37 two-octet characters after the 8-octet name (8 + 66 = 74; a 38th would make 76).
    expect(Buffer.byteLength(parts[0], 'utf8')).toBe(74);
    expect(unfoldIcs(folded)).toBe(line);
  });

  it('leaves a line of exactly 75 octets unfolded and folds one of 76', () => {
    expect(foldIcsLine('X'.repeat(75))).toBe('X'.repeat(75));
    expect(foldIcsLine('X'.repeat(76))).toBe(`${'X'.repeat(75)}\r\n X`);
  });
});

describe('times and UIDs', () => {
  it('formats UTC DATE-TIME form #2', () => {
    expect(icsUtc(Date.UTC(2031, 5, 1, 2, 14, 0) / 1000)).toBe('20310601T021400Z');
    expect(icsUtc(Date.UTC(2031, 11, 31, 23, 59, 59) / 1000 + 0.4)).toBe('20311231T235959Z');
  });

  it('keeps DTEND after DTSTART when the window is shorter than a second', () => {
    const t = Date.UTC(2031, 5, 1, 2, 14, 0) / 1000;
    const ics = renderCalendar([event({ startS: t + 0.2, endS: t + 0.4 })], { dtstampS: DTSTAMP });
    const p = properties(ics);
    expect(p.find((x) => x.name === 'DTSTART')?.value).toBe('20310601T021400Z');
    expect(p.find((x) => x.name === 'DTEND')?.value).toBe('20310601T021401Z');
  });

  it('derives UIDs one-to-one from pass, link and weather', () => {
    expect(eventUid(event())).toBe('ORBILUX-3%2FKaldfjell%2F1.s-band.clear@passbudget.invalid');
    // Without encoding the separator these two would collide.
    expect(eventUid(event({ link: 'a.b', weather: 'c' }))).not.toBe(eventUid(event({ link: 'a', weather: 'b.c' })));
  });

  it('rejects two windows for the same pass, link and weather case', () => {
    expect(() => renderCalendar([event(), event()], { dtstampS: DTSTAMP })).toThrow(/^calendar: two windows for pass ORBILUX-3\/Kaldfjell\/1, link s-band, weather clear/);
  });

  it('puts station, link, peak elevation and volume into SUMMARY', () => {
    const p = properties(renderCalendar([event()], { dtstampS: DTSTAMP }));
    expect(unescapeText(p.find((x) => x.name === 'SUMMARY')?.value ?? '')).toBe('ORBILUX-3 s-band at Kaldfjell: max el 58.0°, 390.00 Mbit');
  });

  it('skips passes with no usable window', () => {
    const input = syntheticScenario();
    const none = input.passes.filter((p) => p.link === 'x-band' && p.cases[2].usableDurationS === 0);
    expect(none.length).toBeGreaterThan(0);
    expect(usableWindowEvents(none, 'p0.1')).toEqual([]);
  });
});
