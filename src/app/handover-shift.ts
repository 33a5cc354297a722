import type { Unit } from '../core/records.ts';
import { shiftFromKey as shiftOfKey } from '../core/shift-key.ts';
import type { ShiftInstance } from '../core/shifts.ts';
import { previousShift, shiftAt } from '../core/shifts.ts';
import { offsetMinutesAt } from '../core/zoned-time-text.ts';
import { clockText, dayClockText } from './time-text.ts';

// Handover happens at the end of a shift, so the desk opens on the shift under way now (the one
// ending) and offers the one before it. A shift is named in routes by its key ('2026-03-28/Night'),
// so a printout made a few minutes after the clocks pass 07:00 still prints the shift on screen.

/** The shift a key names in this unit's pattern and time zone, or null when the key names none. */
export function shiftFromKey(key: string, unit: Unit): ShiftInstance | null {
  return shiftOfKey(key, unit.shiftPattern, unit.timeZone);
}

/** The shift the handover desk shows: the one a route names, else the one under way at nowMs. */
export function handoverShift(unit: Unit, nowMs: number, shiftKey: string | null): ShiftInstance {
  const named = shiftKey === null ? null : shiftFromKey(shiftKey, unit);
  return named ?? shiftAt(nowMs, unit.shiftPattern, unit.timeZone);
}

/** The shift under way at nowMs and the one before it, for the desk's shift switch. */
export function shiftChoices(unit: Unit, nowMs: number): { current: ShiftInstance; previous: ShiftInstance } {
  const current = shiftAt(nowMs, unit.shiftPattern, unit.timeZone);
  return { current, previous: previousShift(current, unit.shiftPattern, unit.timeZone) };
}

/** True when the clocks changed during the shift, so it lasted 11 h or 13 h instead of 12 h. */
export function clocksChangedIn(shift: ShiftInstance, timeZone: string): boolean {
  return offsetMinutesAt(shift.startMs, timeZone) !== offsetMinutesAt(shift.endMs, timeZone);
}

/** A shift's elapsed length: '12 h', '11 h', '8 h 30 min'. */
export function shiftLengthText(durationMs: number): string {
  const minutes = Math.round(durationMs / 60_000);
  const rest = minutes % 60;
  return rest === 0 ? `${Math.floor(minutes / 60)} h` : `${Math.floor(minutes / 60)} h ${rest} min`;
}

/** 'Night shift, Sat 28 Mar 19:00 to 07:00 (11 h; the clocks changed during it)' in the unit's zone. */
export function shiftText(shift: ShiftInstance, timeZone: string): string {
  const clocks = clocksChangedIn(shift, timeZone) ? '; the clocks changed during it' : '';
  return `${shift.name} shift, ${dayClockText(shift.startMs, timeZone)} to ${clockText(shift.endMs, timeZone)} (${shiftLengthText(shift.durationMs)}${clocks})`;
}
