/**
 * iCalendar (RFC 5545) file of usable contact windows: one VEVENT per usable
 * window of a pass, a link and one weather case. Pure string building; the
 * caller writes the file (atomically) and chooses DTSTAMP so the output is
 * reproducible.
 *
 * Rules followed (RFC 5545): CRLF line ends (§3.1), lines folded at 75 octets
 * with a single leading space on continuation lines, never inside a UTF-8
 * character (§3.1), TEXT escaping of backslash, semicolon, comma and newline
 * (§3.3.11), UTC DATE-TIME with a trailing `Z` (§3.3.5), DTEND later than
 * DTSTART (§3.8.2.2), one UID per event (§3.8.4.7). NAME is RFC 7986 §5.1.
 */
import { InputError } from '../errors.js';
import type { PassLinkSummary, Verdict } from '../analysis/types.js';

/** One usable window, the unit a calendar event describes. Times are Unix seconds UTC. */
export interface UsableWindowEvent {
  passId: string;
  satellite: string;
  station: string;
  link: string;
  direction: 'downlink' | 'uplink';
  weather: string;
  startS: number;
  endS: number;
  aosS: number;
  tcaS: number;
  losS: number;
  maxElevationDeg: number;
  usableDurationS: number;
  /** Expected volume (bits): adaptive when the link is adaptive, else fixed-rate. */
  volumeBits: number;
  minMarginDB: number;
  verdict: Verdict;
}

export interface CalendarOptions {
  /** DTSTAMP of every event (Unix seconds UTC), normally the run time; given so output is deterministic. */
  dtstampS: number;
  /** Weather case whose usable windows become events (default: each pass's first case). */
  weather?: string;
  /** Calendar display name (RFC 7986 NAME). */
  calendarName?: string;
  /** Domain part of every UID (default `passbudget.invalid`, a reserved name per RFC 2606). */
  uidDomain?: string;
}

export const ICS_PRODID = '-//passbudget//usable contact windows//EN';
const CRLF = '\r\n';
const MAX_LINE_OCTETS = 75;

/** The usable windows of the chosen weather case (default: the first case of each pass). */
export function usableWindowEvents(passes: Iterable<PassLinkSummary>, weather?: string): UsableWindowEvent[] {
  const events: UsableWindowEvent[] = [];
  for (const p of passes) {
    const c = weather === undefined ? p.cases[0] : p.cases.find((k) => k.weather === weather);
    if (!c) {
      if (weather === undefined) continue;
      const known = p.cases.map((k) => k.weather).join(', ');
      throw new InputError(`calendar weather: case ${JSON.stringify(weather)} not in pass ${p.passId} (allowed: ${known})`);
    }
    if (c.usableStartS === null || c.usableEndS === null || !(c.usableDurationS > 0)) continue;
    events.push({
      passId: p.passId, satellite: p.satellite, station: p.station, link: p.link, direction: p.direction,
      weather: c.weather, startS: c.usableStartS, endS: c.usableEndS,
      aosS: p.aosS, tcaS: p.tcaS, losS: p.losS, maxElevationDeg: p.maxElevationDeg,
      usableDurationS: c.usableDurationS, volumeBits: c.adaptiveVolumeBits ?? c.fixedVolumeBits,
      minMarginDB: c.minMarginDB, verdict: c.verdict,
    });
  }
  return events;
}

/** Escape a TEXT value (RFC 5545 §3.3.11): backslash first, then `;`, `,` and line breaks. */
export function escapeIcsText(text: string): string {
  return text
    .replace(/\\/g, '\\\\')
    .replace(/;/g, '\\;')
    .replace(/,/g, '\\,')
    .replace(/\r\n|\r|\n/g, '\\n');
}

/**
 * Fold one content line at 75 octets (RFC 5545 §3.1). Continuation lines start
 * with one space, which counts toward their 75 octets. Splits fall between
 * code points, so a multi-byte UTF-8 character is never cut.
 */
export function foldIcsLine(line: string): string {
  const parts: string[] = [];
  let current = '';
  let octets = 0;
  let limit = MAX_LINE_OCTETS;
  for (const ch of line) {
    const n = Buffer.byteLength(ch, 'utf8');
    if (octets + n > limit) {
      parts.push(current);
      current = ' ';
      octets = 1;
      limit = MAX_LINE_OCTETS;
    }
    current += ch;
    octets += n;
  }
  parts.push(current);
  return parts.join(CRLF);
}

/** Undo folding (RFC 5545 §3.1): remove every CRLF followed by one space or tab. */
export function unfoldIcs(text: string): string {
  return text.replace(/\r\n[ \t]/g, '');
}

/** UTC DATE-TIME form `YYYYMMDDTHHMMSSZ` (RFC 5545 §3.3.5, form #2). */
export function icsUtc(tS: number): string {
  if (!Number.isFinite(tS)) throw new InputError(`calendar time: not a finite time (got ${tS}; allowed Unix seconds UTC)`);
  return new Date(Math.round(tS) * 1000).toISOString().replace(/[-:]/g, '').replace(/\.\d{3}Z$/, 'Z');
}

/** Deterministic UID from pass, link and weather; every character outside [A-Za-z0-9_-] is %-encoded so the map is one-to-one. */
export function eventUid(e: Pick<UsableWindowEvent, 'passId' | 'link' | 'weather'>, domain = 'passbudget.invalid'): string {
  const enc = (s: string) =>
    Array.from(Buffer.from(s, 'utf8'))
      .map((b) => (/[A-Za-z0-9_-]/.test(String.fromCharCode(b)) ? String.fromCharCode(b) : `%${b.toString(16).toUpperCase().padStart(2, '0')}`))
      .join('');
  return `${enc(e.passId)}.${enc(e.link)}.${enc(e.weather)}@${domain}`;
}

function isEventList(x: UsableWindowEvent[] | PassLinkSummary[]): x is UsableWindowEvent[] {
  return x.length > 0 && 'startS' in x[0];
}

function formatVolume(bits: number): string {
  if (bits >= 1e9) return `${(bits / 1e9).toFixed(2)} Gbit`;
  if (bits >= 1e6) return `${(bits / 1e6).toFixed(2)} Mbit`;
  return `${(bits / 1e3).toFixed(1)} kbit`;
}

function eventLines(e: UsableWindowEvent, dtstamp: string, domain: string): string[] {
  // DTEND must be later than DTSTART (§3.8.2.2): widen outward when whole-second rounding would collapse it.
  let start = Math.round(e.startS);
  let end = Math.round(e.endS);
  if (end <= start) { start = Math.floor(e.startS); end = Math.max(Math.ceil(e.endS), start + 1); }
  const summary = `${e.satellite} ${e.link} at ${e.station}: max el ${e.maxElevationDeg.toFixed(1)}°, ${formatVolume(e.volumeBits)}`;
  const description = [
    `Usable window of pass ${e.passId} (${e.direction}), weather case ${e.weather}.`,
    `Usable ${(e.usableDurationS / 60).toFixed(1)} min, expected volume ${formatVolume(e.volumeBits)}, lowest margin ${e.minMarginDB.toFixed(1)} dB, verdict ${e.verdict}.`,
    `Pass AOS ${icsUtc(e.aosS)}, TCA ${icsUtc(e.tcaS)}, LOS ${icsUtc(e.losS)}, peak elevation ${e.maxElevationDeg.toFixed(1)}°.`,
    'Planning estimate only; transmitting needs the proper licences and frequency coordination.',
  ].join('\n');
  return [
    'BEGIN:VEVENT',
    `UID:${eventUid(e, domain)}`,
    `DTSTAMP:${dtstamp}`,
    `DTSTART:${icsUtc(start)}`,
    `DTEND:${icsUtc(end)}`,
    `SUMMARY:${escapeIcsText(summary)}`,
    `LOCATION:${escapeIcsText(e.station)}`,
    `DESCRIPTION:${escapeIcsText(description)}`,
    `CATEGORIES:${escapeIcsText(e.link)},${escapeIcsText(e.weather)}`,
    'STATUS:TENTATIVE',
    'TRANSP:TRANSPARENT',
    'END:VEVENT',
  ];
}

/**
 * The whole `.ics` text. Accepts ready events or pass summaries (then the
 * usable windows of `opts.weather`, default each pass's first case).
 */
export function renderCalendar(input: UsableWindowEvent[] | PassLinkSummary[], opts: CalendarOptions): string {
  const domain = opts.uidDomain ?? 'passbudget.invalid';
  if (!/^[A-Za-z0-9.-]+$/.test(domain)) {
    throw new InputError(`calendar uidDomain: not a domain name (got ${JSON.stringify(domain)}; allowed letters, digits, '.' and '-')`);
  }
  const events = isEventList(input) ? input : usableWindowEvents(input as PassLinkSummary[], opts.weather);
  const dtstamp = icsUtc(opts.dtstampS);
  const seen = new Set<string>();
  const lines = [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    `PRODID:${ICS_PRODID}`,
    'CALSCALE:GREGORIAN',
    'METHOD:PUBLISH',
  ];
  if (opts.calendarName) lines.push(`NAME:${escapeIcsText(opts.calendarName)}`);
  for (const e of [...events].sort((a, b) => a.startS - b.startS || a.passId.localeCompare(b.passId) || a.link.localeCompare(b.link))) {
    const uid = eventUid(e, domain);
    if (seen.has(uid)) {
      throw new InputError(`calendar: two windows for pass ${e.passId}, link ${e.link}, weather ${e.weather} (allowed one per pass, link and weather case)`);
    }
    seen.add(uid);
    lines.push(...eventLines(e, dtstamp, domain));
  }
  lines.push('END:VCALENDAR');
  return lines.map(foldIcsLine).join(CRLF) + CRLF;
}
