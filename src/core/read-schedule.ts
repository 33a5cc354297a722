import { millisecondsInHour, millisecondsInMinute } from 'date-fns/constants';
import type { FieldError } from './field-error.ts';
import { ValidationError } from './field-error.ts';

// Schedule rules (common practice, no source; the interval is unit policy, not a clinical fact):
// - a newly monitored patient needs a baseline read at once, so the first read is due at the stay start;
// - after that the next read is due intervalHours after the most recent read. Every read counts,
//   routine or extra (alarm, new symptoms, drug change), because an extra read is a full read: it
//   resets the clock rather than adding a read on top;
// - overdue once now is past the due time; due soon within dueSoonMinutes before it;
// - a stay that has ended has nothing due;
// - a read whose strip time is later than now (a tablet clock running fast) still counts as the
//   most recent read and the next read falls due intervalHours after its stated time, so it never
//   brings the due time earlier than a real read now would. Catching the clock error belongs to read
//   entry, which knows the entry time; the schedule takes strip times as given.
// Callers pass the reads of this one stay only.

/** Read interval a unit uses unless it sets another: every 4 hours (unit policy; common practice, no source). */
export const defaultReadIntervalHours = 4;
/** How long before a read falls due the bed shows "due soon" (common practice, no source). */
export const defaultDueSoonMinutes = 30;
/** How long after a read fell due it still counts as on time in a handover (common practice, no source). */
export const defaultGraceMinutes = 30;

/** What the schedule needs to know about one stay at one moment. */
export interface ScheduleInput {
  stayStartMs: number;
  stayEndMs?: number | null;
  /** Strip times of the stay's signed reads, any order, extra reads included. */
  readTimesMs: number[];
  intervalHours: number;
  nowMs: number;
  dueSoonMinutes?: number;
}

/** Where a stay stands against its read schedule. */
export type ScheduleStatus = 'not-started' | 'on-time' | 'due-soon' | 'overdue' | 'ended';

/** A stay's schedule at one moment: last read, next due time, and how far over or under it now is. */
export interface ScheduleState {
  status: ScheduleStatus;
  lastReadMs: number | null;
  /** Null once the stay has ended. */
  nextDueMs: number | null;
  /** 0 unless overdue. */
  overdueByMs: number;
  /** 0 when overdue; null once the stay has ended. */
  dueInMs: number | null;
}

/** One due time in a shift and how it was met. */
export interface DueSlot {
  dueMs: number;
  metByReadMs: number | null;
  /** 0 if on time (within grace, or early). */
  lateByMs: number;
  missed: boolean;
}

/** How a shift kept to the read schedule, for the handover summary. */
export interface ShiftAdherence {
  readsInShift: number;
  dueSlots: DueSlot[];
  lateCount: number;
  missedCount: number;
}

/** What the adherence view needs: the stay, its reads, the schedule and the shift in question. */
export interface ShiftAdherenceInput {
  stayStartMs: number;
  stayEndMs?: number | null;
  readTimesMs: number[];
  intervalHours: number;
  shiftStartMs: number;
  shiftEndMs: number;
  nowMs: number;
  graceMinutes?: number;
}

/** The stay's schedule state at nowMs: next read due intervalHours after the last read, the first at the stay start. */
export function readScheduleState(input: ScheduleInput): ScheduleState {
  const errors = [
    ...stayErrors(input.stayStartMs, input.stayEndMs),
    ...readTimeErrors(input.readTimesMs),
    ...intervalErrors(input.intervalHours),
    ...finiteErrors('nowMs', input.nowMs),
    ...nonNegativeErrors('dueSoonMinutes', input.dueSoonMinutes ?? defaultDueSoonMinutes),
  ];
  if (errors.length > 0) throw new ValidationError(errors);

  const lastReadMs = input.readTimesMs.reduce<number | null>((latestMs, readMs) => (latestMs === null || readMs > latestMs ? readMs : latestMs), null);
  const { nowMs } = input;
  if (input.stayEndMs != null && input.stayEndMs <= nowMs) {
    return { status: 'ended', lastReadMs, nextDueMs: null, overdueByMs: 0, dueInMs: null };
  }
  const nextDueMs = lastReadMs === null ? input.stayStartMs : lastReadMs + input.intervalHours * millisecondsInHour;
  const overdueByMs = Math.max(0, nowMs - nextDueMs);
  const dueInMs = Math.max(0, nextDueMs - nowMs);
  const dueSoonMs = (input.dueSoonMinutes ?? defaultDueSoonMinutes) * millisecondsInMinute;
  let status: ScheduleStatus;
  if (nowMs < input.stayStartMs) status = 'not-started';
  else if (nowMs > nextDueMs) status = 'overdue';
  else if (dueInMs <= dueSoonMs) status = 'due-soon';
  else status = 'on-time';
  return { status, lastReadMs, nextDueMs, overdueByMs, dueInMs };
}

// Adherence definition (common practice, no source), kept simple so a handover reads the same
// on every tablet:
// - the due times form one chain over the whole stay, as in readScheduleState: the first falls
//   at the stay start; each read, taken in time order, meets the due time current when it is
//   taken (even early, since every read resets the clock) and the next falls intervalHours after it;
// - if a full interval passes after a due time with no read, that due time is missed and the next
//   falls intervalHours after it (each interval without a read is another missed read);
// - a shift lists the due times from its start (inclusive) to its end (exclusive) that are not
//   after nowMs and not at or after the stay end;
// - within the shift, a due time is met by its read when that read comes before the next due time,
//   the shift end and the stay end; it is late when the read came more than graceMinutes after it,
//   lateByMs being the whole time from due to read; it is missed when that window has closed by
//   nowMs with no read; otherwise it is still open (neither met nor missed yet).
// Reads taken before the stay start set the clock like any other read. Identical strip times
// count once, so a read saved twice does not meet two due times.

/** Due times falling in one shift and whether each was met on time, late or missed. */
export function shiftReadAdherence(input: ShiftAdherenceInput): ShiftAdherence {
  const graceMinutes = input.graceMinutes ?? defaultGraceMinutes;
  const errors = [
    ...stayErrors(input.stayStartMs, input.stayEndMs),
    ...readTimeErrors(input.readTimesMs),
    ...intervalErrors(input.intervalHours),
    ...finiteErrors('shiftStartMs', input.shiftStartMs),
    ...finiteErrors('shiftEndMs', input.shiftEndMs),
    ...finiteErrors('nowMs', input.nowMs),
    ...nonNegativeErrors('graceMinutes', graceMinutes),
  ];
  if (errors.length === 0 && input.shiftEndMs <= input.shiftStartMs) {
    errors.push({ field: 'shiftEndMs', message: 'A shift must end after it starts.' });
  }
  if (errors.length > 0) throw new ValidationError(errors);

  const intervalMs = input.intervalHours * millisecondsInHour;
  const graceMs = graceMinutes * millisecondsInMinute;
  const stayEndMs = input.stayEndMs ?? Number.POSITIVE_INFINITY;
  const { shiftStartMs, shiftEndMs, nowMs } = input;
  const readsMs = [...new Set(input.readTimesMs)].sort((a, b) => a - b);
  // Due times from here on are after the shift, the stay or now, so the walk stops.
  const beyondListing = (dueMs: number): boolean => dueMs >= shiftEndMs || dueMs >= stayEndMs || dueMs > nowMs;

  const dueSlots: DueSlot[] = [];
  const list = (dueMs: number, readMs: number | null): void => {
    if (dueMs < shiftStartMs || beyondListing(dueMs)) return;
    const windowEndMs = Math.min(dueMs + intervalMs, shiftEndMs, stayEndMs);
    if (readMs !== null && readMs < windowEndMs) {
      const lateByMs = readMs - dueMs > graceMs ? readMs - dueMs : 0;
      dueSlots.push({ dueMs, metByReadMs: readMs, lateByMs, missed: false });
    } else {
      dueSlots.push({ dueMs, metByReadMs: null, lateByMs: 0, missed: windowEndMs <= nowMs });
    }
  };
  // Lists the due times that pass a full interval with no read before nextReadMs, and returns
  // the due time that read will meet. Whole intervals before the shift are skipped in one step
  // so a long stay with a short interval stays cheap.
  const listUnreadUntil = (dueMs: number, nextReadMs: number): number => {
    let currentDueMs = dueMs;
    if (currentDueMs < shiftStartMs && nextReadMs >= currentDueMs + intervalMs) {
      const unread = Math.floor((nextReadMs - currentDueMs) / intervalMs);
      const beforeShift = Math.ceil((shiftStartMs - currentDueMs) / intervalMs);
      // One fewer than both counts, so rounding can never skip a due time inside the shift.
      const skippable = Math.min(unread, beforeShift) - 1;
      if (skippable > 0) currentDueMs += skippable * intervalMs;
    }
    while (nextReadMs >= currentDueMs + intervalMs && !beyondListing(currentDueMs)) {
      list(currentDueMs, null);
      currentDueMs += intervalMs;
    }
    return currentDueMs;
  };

  let dueMs = input.stayStartMs;
  for (const readMs of readsMs) {
    dueMs = listUnreadUntil(dueMs, readMs);
    if (beyondListing(dueMs)) break;
    list(dueMs, readMs);
    dueMs = readMs + intervalMs;
  }
  // After the last read every due time is unread: missed once its window has closed, else still open.
  listUnreadUntil(dueMs, Number.POSITIVE_INFINITY);

  const readsInShift = readsMs.filter((readMs) => readMs >= shiftStartMs && readMs < shiftEndMs).length;
  return {
    readsInShift,
    dueSlots,
    lateCount: dueSlots.filter((slot) => slot.lateByMs > 0).length,
    missedCount: dueSlots.filter((slot) => slot.missed).length,
  };
}

function finiteErrors(field: string, value: number): FieldError[] {
  return Number.isFinite(value) ? [] : [{ field, message: `${field} must be a finite number.` }];
}

function nonNegativeErrors(field: string, value: number): FieldError[] {
  return Number.isFinite(value) && value >= 0 ? [] : [{ field, message: `${field} must be 0 or more.`, min: 0 }];
}

/** Shortest read interval accepted: one minute, far below any unit's policy, so the walk always moves forward. */
const minIntervalHours = 1 / 60;

function intervalErrors(intervalHours: number): FieldError[] {
  return Number.isFinite(intervalHours) && intervalHours >= minIntervalHours
    ? []
    : [{ field: 'intervalHours', message: 'The read interval must be at least one minute, given in hours.', min: minIntervalHours }];
}

function stayErrors(stayStartMs: number, stayEndMs: number | null | undefined): FieldError[] {
  const errors = finiteErrors('stayStartMs', stayStartMs);
  if (stayEndMs != null) {
    errors.push(...finiteErrors('stayEndMs', stayEndMs));
    if (errors.length === 0 && stayEndMs < stayStartMs) {
      errors.push({ field: 'stayEndMs', message: 'A stay cannot end before it starts.' });
    }
  }
  return errors;
}

function readTimeErrors(readTimesMs: number[]): FieldError[] {
  return readTimesMs.every((readMs) => Number.isFinite(readMs))
    ? []
    : [{ field: 'readTimesMs', message: 'Every read time must be a finite time in epoch milliseconds.' }];
}
