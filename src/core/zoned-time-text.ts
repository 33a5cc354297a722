import { tzOffset } from '@date-fns/tz';
import { ValidationError } from './field-error.ts';

// Exports and handover text state times on the unit's wall clock, with the offset in force at that
// instant, so a reader in another zone (or after a clock change) can still place every read exactly.

const minuteMs = 60_000;

/** The unit time zone's offset from UTC at an instant, in whole minutes; refuses an unknown zone by name. */
export function offsetMinutesAt(epochMs: number, timeZone: string): number {
  if (!Number.isFinite(epochMs)) {
    throw new ValidationError([{ field: 'epochMs', message: `epochMs must be a finite time in epoch milliseconds; got ${String(epochMs)}` }]);
  }
  const offset = typeof timeZone === 'string' && timeZone !== '' ? tzOffset(timeZone, new Date(epochMs)) : Number.NaN;
  if (!Number.isFinite(offset)) {
    throw new ValidationError([{ field: 'timeZone', message: `timeZone "${String(timeZone)}" is not a known IANA time zone (e.g. Europe/Berlin)` }]);
  }
  return Math.round(offset);
}

const two = (n: number): string => String(n).padStart(2, '0');

interface WallClock {
  date: string;
  time: string;
  seconds: string;
  millis: number;
  offset: string;
}

function wallClock(epochMs: number, timeZone: string): WallClock {
  const offsetMinutes = offsetMinutesAt(epochMs, timeZone);
  const local = new Date(epochMs + offsetMinutes * minuteMs);
  const sign = offsetMinutes < 0 ? '-' : '+';
  const abs = Math.abs(offsetMinutes);
  return {
    date: `${String(local.getUTCFullYear()).padStart(4, '0')}-${two(local.getUTCMonth() + 1)}-${two(local.getUTCDate())}`,
    time: `${two(local.getUTCHours())}:${two(local.getUTCMinutes())}`,
    seconds: two(local.getUTCSeconds()),
    millis: local.getUTCMilliseconds(),
    offset: `${sign}${two(Math.floor(abs / 60))}:${two(abs % 60)}`,
  };
}

/** ISO 8601 local time with its UTC offset in the unit's zone, e.g. '2026-03-28T19:00:00+01:00' (milliseconds only when not zero). */
export function isoWithOffset(epochMs: number, timeZone: string): string {
  const w = wallClock(epochMs, timeZone);
  const millis = w.millis === 0 ? '' : `.${String(w.millis).padStart(3, '0')}`;
  return `${w.date}T${w.time}:${w.seconds}${millis}${w.offset}`;
}

/** Wall-clock 'HH:mm' in the unit's zone, for text where the day is already clear. */
export function localClockText(epochMs: number, timeZone: string): string {
  return wallClock(epochMs, timeZone).time;
}

/** Wall-clock 'yyyy-MM-dd HH:mm' in the unit's zone. */
export function localDateTimeText(epochMs: number, timeZone: string): string {
  const w = wallClock(epochMs, timeZone);
  return `${w.date} ${w.time}`;
}
