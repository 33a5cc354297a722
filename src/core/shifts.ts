import { tzOffset } from '@date-fns/tz';
import { millisecondsInDay, millisecondsInMinute } from 'date-fns/constants';
import type { FieldError } from './field-error.ts';
import { ValidationError } from './field-error.ts';

// Shift patterns are unit policy (common practice, no source): a unit rosters e.g. 2 x 12 h
// (Day 07:00 / Night 19:00) or 3 x 8 h (Early 07:00 / Late 15:00 / Night 23:00) by the clock on
// the ward wall. Start times are therefore local wall-clock times in the unit's time zone, and
// a shift lasts from its start to the next shift's start in elapsed time: a 12 h night shift
// over a daylight-saving change really lasts 11 h (spring) or 13 h (autumn).
//
// Wall-clock rule across daylight-saving changes:
// - a start time that does not exist that night (spring-forward gap, e.g. 02:30 in Berlin on
//   the last Sunday of March) starts at the first instant that does exist, the moment the clocks
//   jump (03:00 local), so no time is left uncovered and no shift starts before its rostered time;
// - a start time that happens twice (autumn fall-back, e.g. 02:30 in Berlin on the last Sunday of
//   October) starts at the earlier of the two instants, so the outgoing nurse never stays an
//   extra hour unrostered.
// If two start times fall into the same gap, the earlier shift has no duration that night and
// is never returned; the later one covers the time.

/** One shift of a unit's roster: its name and its local 'HH:mm' (24 h) start in the unit's time zone. */
export interface ShiftDefinition {
  name: string;
  startLocalTime: string;
}

/** A unit's shifts in order through the day; each ends when the next starts, the last at the first's start the next day. */
export interface ShiftPattern {
  shifts: ShiftDefinition[];
}

/** One worked shift: a pattern entry on a rostered local date, with its real start and end instants. */
export interface ShiftInstance {
  name: string;
  /** Position of the shift in the pattern. */
  index: number;
  startMs: number;
  endMs: number;
  /** Elapsed length; differs from the wall-clock length across a daylight-saving change. */
  durationMs: number;
  /** The rostered local calendar date ('yyyy-MM-dd') of the start, in the unit's time zone. */
  startLocalDate: string;
  /** Stable identifier for handovers, e.g. '2026-03-28/Night'. */
  key: string;
}

// A UTC calendar day is always 24 h; local days may be 23 h or 25 h, so only UTC days are counted this way.
const millisecondsInUtcDay = millisecondsInDay;
/** Instants this close to the ends of the JavaScript date range are refused, so a day either side stays valid. */
const maxEpochMs = 8_640_000_000_000_000 - 7 * millisecondsInUtcDay;

const localTimeFormat = /^([01]\d|2[0-3]):([0-5]\d)$/;

/** Problems with a shift pattern in words a unit admin can act on; empty when the pattern is usable. */
export function validateShiftPattern(pattern: ShiftPattern): string[] {
  return shiftPatternErrors(pattern).map((error) => error.message);
}

/** The shift instance that contains atMs (startMs <= atMs < endMs) in the unit's time zone. */
export function shiftAt(atMs: number, pattern: ShiftPattern, timeZone: string): ShiftInstance {
  const roster = checkedRoster(pattern, timeZone);
  checkEpochMs('atMs', atMs);
  return shiftContaining(atMs, roster);
}

/** Every shift instance that overlaps [fromMs, toMs), in time order; empty when toMs <= fromMs. */
export function shiftsOverlapping(fromMs: number, toMs: number, pattern: ShiftPattern, timeZone: string): ShiftInstance[] {
  const roster = checkedRoster(pattern, timeZone);
  checkEpochMs('fromMs', fromMs);
  checkEpochMs('toMs', toMs);
  const shifts: ShiftInstance[] = [];
  if (toMs <= fromMs) return shifts;
  for (let shift = shiftContaining(fromMs, roster); shift.startMs < toMs; shift = shiftContaining(shift.endMs, roster)) {
    shifts.push(shift);
  }
  return shifts;
}

/** The shift that ends when the given one starts (the outgoing shift at its handover). */
export function previousShift(shift: ShiftInstance, pattern: ShiftPattern, timeZone: string): ShiftInstance {
  const roster = checkedRoster(pattern, timeZone);
  checkEpochMs('shift.startMs', shift.startMs);
  // Shift bounds are whole milliseconds, so the last millisecond before the start belongs to the previous shift.
  return shiftContaining(shift.startMs - 1, roster);
}

/** The shift that starts when the given one ends (the incoming shift at its handover). */
export function nextShift(shift: ShiftInstance, pattern: ShiftPattern, timeZone: string): ShiftInstance {
  const roster = checkedRoster(pattern, timeZone);
  checkEpochMs('shift.endMs', shift.endMs);
  return shiftContaining(shift.endMs, roster);
}

/** The local calendar date ('yyyy-MM-dd') of an instant in the given time zone. */
export function localDateAt(atMs: number, timeZone: string): string {
  checkTimeZone(timeZone);
  checkEpochMs('atMs', atMs);
  return formatLocalDay(localDayAt(atMs, timeZone));
}

/** The instant a local 'yyyy-MM-dd' date and 'HH:mm' time denote in the time zone, by the gap and fall-back rule above. */
export function localDateTimeToEpochMs(localDate: string, localTime: string, timeZone: string): number {
  checkTimeZone(timeZone);
  const dateMatch = /^(\d{4})-(\d{2})-(\d{2})$/.exec(localDate);
  const localDay = dateMatch ? Date.UTC(Number(dateMatch[1]), Number(dateMatch[2]) - 1, Number(dateMatch[3])) / millisecondsInUtcDay : NaN;
  if (!dateMatch || formatLocalDay(localDay) !== localDate) {
    throw new ValidationError([{ field: 'localDate', message: `Date "${localDate}" is not a calendar date written yyyy-MM-dd.` }]);
  }
  const minuteOfDay = parseLocalTime(localTime);
  if (minuteOfDay === null) {
    throw new ValidationError([{ field: 'localTime', message: `Time "${localTime}" is not HH:mm (24-hour, e.g. 07:00).` }]);
  }
  return wallClockToEpochMs(localDay, minuteOfDay, timeZone);
}

interface Roster {
  pattern: ShiftPattern;
  startMinutes: number[];
  timeZone: string;
}

function shiftPatternErrors(pattern: ShiftPattern): FieldError[] {
  const errors: FieldError[] = [];
  const shifts = pattern.shifts;
  if (shifts.length === 0) {
    errors.push({ field: 'shifts', message: 'A shift pattern needs at least one shift.' });
    return errors;
  }
  const namesSeen = new Set<string>();
  let previous: { label: string; startLocalTime: string; minuteOfDay: number } | null = null;
  shifts.forEach((shift, index) => {
    const label = shift.name.trim() === '' ? `Shift ${index + 1}` : `Shift "${shift.name}"`;
    if (shift.name.trim() === '') {
      errors.push({ field: `shifts[${index}].name`, message: `Shift ${index + 1} has no name.` });
    } else if (namesSeen.has(shift.name)) {
      errors.push({ field: `shifts[${index}].name`, message: `Shift name "${shift.name}" is used more than once.` });
    }
    namesSeen.add(shift.name);
    const minuteOfDay = parseLocalTime(shift.startLocalTime);
    if (minuteOfDay === null) {
      errors.push({
        field: `shifts[${index}].startLocalTime`,
        message: `${label} start time "${shift.startLocalTime}" is not HH:mm (24-hour, e.g. 07:00).`,
      });
      return;
    }
    if (previous !== null && minuteOfDay <= previous.minuteOfDay) {
      errors.push({
        field: `shifts[${index}].startLocalTime`,
        message: `${label} starts at ${shift.startLocalTime}, not after ${previous.label} at ${previous.startLocalTime}; list shifts in order through the day with distinct start times.`,
      });
    }
    previous = { label, startLocalTime: shift.startLocalTime, minuteOfDay };
  });
  return errors;
}

function parseLocalTime(localTime: string): number | null {
  const match = localTimeFormat.exec(localTime);
  if (!match) return null;
  return Number(match[1]) * 60 + Number(match[2]);
}

function checkedRoster(pattern: ShiftPattern, timeZone: string): Roster {
  const errors = shiftPatternErrors(pattern);
  if (errors.length > 0) throw new ValidationError(errors);
  checkTimeZone(timeZone);
  // Valid patterns have parseable times, so every entry maps to a number.
  const startMinutes = pattern.shifts.map((shift) => parseLocalTime(shift.startLocalTime) ?? 0);
  return { pattern, startMinutes, timeZone };
}

function checkTimeZone(timeZone: string): void {
  // An empty or missing zone would silently fall back to the tablet's own zone, which is not the unit's.
  if (typeof timeZone !== 'string' || timeZone === '' || Number.isNaN(tzOffset(timeZone, new Date(0)))) {
    throw new ValidationError([{ field: 'timeZone', message: `"${String(timeZone)}" is not a known IANA time zone (e.g. Europe/Berlin).` }]);
  }
}

function checkEpochMs(field: string, epochMs: number): void {
  if (!Number.isFinite(epochMs) || Math.abs(epochMs) > maxEpochMs) {
    throw new ValidationError([{ field, message: `${field} must be a finite time in epoch milliseconds.`, min: -maxEpochMs, max: maxEpochMs }]);
  }
}

function offsetMsAt(epochMs: number, timeZone: string): number {
  return Math.round(tzOffset(timeZone, new Date(epochMs)) * millisecondsInMinute);
}

/** Local calendar day number (days since 1970-01-01 on the unit's calendar) of an instant. */
function localDayAt(epochMs: number, timeZone: string): number {
  return Math.floor((epochMs + offsetMsAt(epochMs, timeZone)) / millisecondsInUtcDay);
}

function formatLocalDay(localDay: number): string {
  const date = new Date(localDay * millisecondsInUtcDay);
  const year = String(date.getUTCFullYear()).padStart(4, '0');
  const month = String(date.getUTCMonth() + 1).padStart(2, '0');
  const day = String(date.getUTCDate()).padStart(2, '0');
  return `${year}-${month}-${day}`;
}

/** The instant a local wall-clock reading denotes: earlier instant when it happens twice, the clock change when it never happens. */
function wallClockToEpochMs(localDay: number, minuteOfDay: number, timeZone: string): number {
  // The wall reading written as if it were UTC; subtracting the offset in force gives the instant.
  const wallMs = localDay * millisecondsInUtcDay + minuteOfDay * millisecondsInMinute;
  // Offsets a day either side bracket any clock change near this reading (changes are months apart).
  const offsetsMs = [...new Set([-1, 0, 1].map((days) => offsetMsAt(wallMs + days * millisecondsInUtcDay, timeZone)))];
  const instantsMs = offsetsMs.map((offsetMs) => wallMs - offsetMs).filter((instantMs) => instantMs + offsetMsAt(instantMs, timeZone) === wallMs);
  if (instantsMs.length > 0) return Math.min(...instantsMs);
  // Spring-forward gap: the clock change lies after the reading read with the new (larger) offset
  // and at or before it read with the old one; find the first instant on the new offset.
  let beforeChangeMs = wallMs - Math.max(...offsetsMs);
  let afterChangeMs = wallMs - Math.min(...offsetsMs);
  const offsetAfterMs = offsetMsAt(afterChangeMs, timeZone);
  while (afterChangeMs - beforeChangeMs > 1) {
    const middleMs = Math.floor((beforeChangeMs + afterChangeMs) / 2);
    if (offsetMsAt(middleMs, timeZone) === offsetAfterMs) afterChangeMs = middleMs;
    else beforeChangeMs = middleMs;
  }
  return afterChangeMs;
}

function shiftStartMs(localDay: number, index: number, roster: Roster): number {
  return wallClockToEpochMs(localDay, roster.startMinutes[index] ?? 0, roster.timeZone);
}

function shiftContaining(atMs: number, roster: Roster): ShiftInstance {
  const shiftCount = roster.startMinutes.length;
  const today = localDayAt(atMs, roster.timeZone);
  // Starts from two days before to two days after, in roster order; the containing shift is the
  // last one started by atMs, and the one after it gives its end. Two days either side cover
  // a 24 h pattern even where a clock change falls near midnight.
  const starts: Array<{ localDay: number; index: number; startMs: number }> = [];
  for (let localDay = today - 2; localDay <= today + 2; localDay += 1) {
    for (let index = 0; index < shiftCount; index += 1) {
      starts.push({ localDay, index, startMs: shiftStartMs(localDay, index, roster) });
    }
  }
  let position = -1;
  starts.forEach((start, i) => {
    if (start.startMs <= atMs) position = i;
  });
  const current = starts[position];
  const following = starts[position + 1];
  if (current === undefined || following === undefined) {
    throw new Error(`No shift found around ${atMs} in ${roster.timeZone}.`);
  }
  const definition = roster.pattern.shifts[current.index];
  const name = definition?.name ?? '';
  const startLocalDate = formatLocalDay(current.localDay);
  return {
    name,
    index: current.index,
    startMs: current.startMs,
    endMs: following.startMs,
    durationMs: following.startMs - current.startMs,
    startLocalDate,
    key: `${startLocalDate}/${name}`,
  };
}
