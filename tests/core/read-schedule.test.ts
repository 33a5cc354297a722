import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import type { ScheduleInput, ShiftAdherenceInput } from '../../src/core/read-schedule.ts';
import { defaultReadIntervalHours, readScheduleState, shiftReadAdherence } from '../../src/core/read-schedule.ts';
import type { ShiftPattern } from '../../src/core/shifts.ts';
import { shiftAt } from '../../src/core/shifts.ts';

// The q4h interval, the 30 min "due soon" warning and the 30 min grace are unit policy
// (common practice, no source), as is the baseline read at admission.
const minuteMs = 60_000;
const hourMs = 3_600_000;
const at = (iso: string): number => Date.parse(iso);
const stayStartMs = at('2026-03-10T08:00:00Z');
const schedule = (overrides: Partial<ScheduleInput>): ScheduleInput => ({
  stayStartMs,
  readTimesMs: [],
  intervalHours: defaultReadIntervalHours,
  nowMs: stayStartMs,
  ...overrides,
});

describe('readScheduleState', () => {
  it('has the first read due at admission (a baseline read at once)', () => {
    expect(readScheduleState(schedule({ nowMs: stayStartMs }))).toEqual({
      status: 'due-soon',
      lastReadMs: null,
      nextDueMs: stayStartMs,
      overdueByMs: 0,
      dueInMs: 0,
    });
  });

  it('is overdue by the exact time since admission when no read has been signed', () => {
    expect(readScheduleState(schedule({ nowMs: stayStartMs + 17 * minuteMs + 30_000 }))).toEqual({
      status: 'overdue',
      lastReadMs: null,
      nextDueMs: stayStartMs,
      overdueByMs: 1_050_000,
      dueInMs: 0,
    });
  });

  it('has not started before the stay starts, with the baseline read due at the start', () => {
    expect(readScheduleState(schedule({ nowMs: stayStartMs - 45 * minuteMs }))).toEqual({
      status: 'not-started',
      lastReadMs: null,
      nextDueMs: stayStartMs,
      overdueByMs: 0,
      dueInMs: 45 * minuteMs,
    });
  });

  it('is on time two hours after a read, with the next read due four hours after it', () => {
    expect(readScheduleState(schedule({ readTimesMs: [at('2026-03-10T08:05:00Z')], nowMs: at('2026-03-10T10:05:00Z') }))).toEqual({
      status: 'on-time',
      lastReadMs: at('2026-03-10T08:05:00Z'),
      nextDueMs: at('2026-03-10T12:05:00Z'),
      overdueByMs: 0,
      dueInMs: 2 * hourMs,
    });
  });

  it('is due soon from 30 minutes before the due time up to the due time itself', () => {
    const readTimesMs = [at('2026-03-10T08:00:00Z')];
    expect(readScheduleState(schedule({ readTimesMs, nowMs: at('2026-03-10T11:29:59.999Z') })).status).toBe('on-time');
    expect(readScheduleState(schedule({ readTimesMs, nowMs: at('2026-03-10T11:30:00Z') }))).toMatchObject({ status: 'due-soon', dueInMs: 30 * minuteMs });
    expect(readScheduleState(schedule({ readTimesMs, nowMs: at('2026-03-10T12:00:00Z') }))).toMatchObject({ status: 'due-soon', dueInMs: 0, overdueByMs: 0 });
    expect(readScheduleState(schedule({ readTimesMs, nowMs: at('2026-03-10T12:00:00.001Z') }))).toMatchObject({ status: 'overdue', overdueByMs: 1 });
  });

  it('uses a unit-set warning window', () => {
    const readTimesMs = [at('2026-03-10T08:00:00Z')];
    expect(readScheduleState(schedule({ readTimesMs, dueSoonMinutes: 60, nowMs: at('2026-03-10T11:00:00Z') })).status).toBe('due-soon');
    expect(readScheduleState(schedule({ readTimesMs, dueSoonMinutes: 0, nowMs: at('2026-03-10T11:59:00Z') })).status).toBe('on-time');
  });

  it('restarts the clock at an extra read (alarm) taken between routine reads, whatever the list order', () => {
    const state = readScheduleState(
      schedule({ readTimesMs: [at('2026-03-10T09:30:00Z'), at('2026-03-10T08:00:00Z')], nowMs: at('2026-03-10T12:30:00Z') }),
    );
    expect(state).toEqual({
      status: 'on-time',
      lastReadMs: at('2026-03-10T09:30:00Z'),
      nextDueMs: at('2026-03-10T13:30:00Z'),
      overdueByMs: 0,
      dueInMs: hourMs,
    });
  });

  it('follows a unit interval other than 4 h (q2h for a patient on a QT-prolonging infusion)', () => {
    expect(
      readScheduleState(schedule({ readTimesMs: [at('2026-03-10T08:00:00Z')], intervalHours: 2, nowMs: at('2026-03-10T10:40:00Z') })),
    ).toMatchObject({ status: 'overdue', nextDueMs: at('2026-03-10T10:00:00Z'), overdueByMs: 40 * minuteMs });
  });

  it('has nothing due once the stay has ended, including at the very end instant', () => {
    const readTimesMs = [at('2026-03-10T08:00:00Z')];
    const ended = { status: 'ended', lastReadMs: at('2026-03-10T08:00:00Z'), nextDueMs: null, overdueByMs: 0, dueInMs: null };
    expect(readScheduleState(schedule({ readTimesMs, stayEndMs: at('2026-03-10T14:00:00Z'), nowMs: at('2026-03-10T15:00:00Z') }))).toEqual(ended);
    expect(readScheduleState(schedule({ readTimesMs, stayEndMs: at('2026-03-10T15:00:00Z'), nowMs: at('2026-03-10T15:00:00Z') }))).toEqual(ended);
    expect(readScheduleState(schedule({ readTimesMs, stayEndMs: at('2026-03-10T15:00:01Z'), nowMs: at('2026-03-10T15:00:00Z') })).status).toBe('overdue');
    expect(readScheduleState(schedule({ readTimesMs, stayEndMs: null, nowMs: at('2026-03-10T15:00:00Z') })).status).toBe('overdue');
  });

  it('counts a read stamped in the future (tablet clock fast) as the last read, due four hours after its stated time', () => {
    expect(
      readScheduleState(schedule({ readTimesMs: [at('2026-03-10T08:00:00Z'), at('2026-03-10T10:45:00Z')], nowMs: at('2026-03-10T10:00:00Z') })),
    ).toEqual({
      status: 'on-time',
      lastReadMs: at('2026-03-10T10:45:00Z'),
      nextDueMs: at('2026-03-10T14:45:00Z'),
      overdueByMs: 0,
      dueInMs: 4 * hourMs + 45 * minuteMs,
    });
  });

  describe('edge cases', () => {
    it('refuses NaN times, a zero or negative interval and a negative warning window, naming each field', () => {
      expect(() => readScheduleState(schedule({ nowMs: Number.NaN, intervalHours: 0, dueSoonMinutes: -1, readTimesMs: [Number.NaN] }))).toThrow(
        expect.objectContaining({
          errors: [
            { field: 'readTimesMs', message: 'Every read time must be a finite time in epoch milliseconds.' },
            { field: 'intervalHours', message: 'The read interval must be at least one minute, given in hours.', min: 1 / 60 },
            { field: 'nowMs', message: 'nowMs must be a finite number.' },
            { field: 'dueSoonMinutes', message: 'dueSoonMinutes must be 0 or more.', min: 0 },
          ],
        }),
      );
    });

    it('refuses a stay that ends before it starts', () => {
      expect(() => readScheduleState(schedule({ stayEndMs: stayStartMs - 1 }))).toThrow(ValidationError);
    });

    it('accepts a stay of zero length as ended', () => {
      expect(readScheduleState(schedule({ stayEndMs: stayStartMs })).status).toBe('ended');
    });
  });

  describe('properties', () => {
    const input = fc.record({
      stayStartMs: fc.integer({ min: at('2026-01-01T00:00:00Z'), max: at('2026-02-01T00:00:00Z') }),
      readOffsetsMs: fc.array(fc.integer({ min: -hourMs, max: 10 * 24 * hourMs }), { maxLength: 20 }),
      nowOffsetMs: fc.integer({ min: -hourMs, max: 12 * 24 * hourMs }),
      intervalHours: fc.constantFrom(1, 2, 4, 6, 8),
    });

    it('never puts the next read earlier than the last read plus the interval, and never reports negative times', () => {
      fc.assert(
        fc.property(input, ({ stayStartMs: startMs, readOffsetsMs, nowOffsetMs, intervalHours }) => {
          const state = readScheduleState({
            stayStartMs: startMs,
            readTimesMs: readOffsetsMs.map((offsetMs) => startMs + offsetMs),
            intervalHours,
            nowMs: startMs + nowOffsetMs,
          });
          if (state.lastReadMs !== null && state.nextDueMs !== null) {
            expect(state.nextDueMs).toBeGreaterThanOrEqual(state.lastReadMs + intervalHours * hourMs);
          }
          expect(state.overdueByMs).toBeGreaterThanOrEqual(0);
          expect(state.dueInMs).toBeGreaterThanOrEqual(0);
          expect(state.status === 'overdue').toBe(state.overdueByMs > 0);
        }),
      );
    });
  });
});

describe('shiftReadAdherence', () => {
  const dayShift = { shiftStartMs: at('2026-03-10T07:00:00Z'), shiftEndMs: at('2026-03-10T19:00:00Z') };
  const adherence = (overrides: Partial<ShiftAdherenceInput>): ShiftAdherenceInput => ({
    stayStartMs: at('2026-03-10T01:00:00Z'),
    readTimesMs: [],
    intervalHours: 4,
    nowMs: dayShift.shiftEndMs,
    ...dayShift,
    ...overrides,
  });

  it('finds one late and one missed read in a 12 h day shift', () => {
    // 05:10 read makes 09:10 due; the 10:00 read is 50 min late. 14:00 passes a full interval
    // unread, so it is missed and 18:00 falls due; the 18:30 read meets it at the end of grace.
    const readTimesMs = ['01:00', '05:10', '10:00', '18:30'].map((time) => at(`2026-03-10T${time}:00Z`));
    expect(shiftReadAdherence(adherence({ readTimesMs }))).toEqual({
      readsInShift: 2,
      dueSlots: [
        { dueMs: at('2026-03-10T09:10:00Z'), metByReadMs: at('2026-03-10T10:00:00Z'), lateByMs: 50 * minuteMs, missed: false },
        { dueMs: at('2026-03-10T14:00:00Z'), metByReadMs: null, lateByMs: 0, missed: true },
        { dueMs: at('2026-03-10T18:00:00Z'), metByReadMs: at('2026-03-10T18:30:00Z'), lateByMs: 0, missed: false },
      ],
      lateCount: 1,
      missedCount: 1,
    });
  });

  it('counts four-hourly due times in elapsed hours across the 11 h Berlin night', () => {
    const pattern: ShiftPattern = {
      shifts: [
        { name: 'Day', startLocalTime: '07:00' },
        { name: 'Night', startLocalTime: '19:00' },
      ],
    };
    const night = shiftAt(at('2026-03-28T20:00:00Z'), pattern, 'Europe/Berlin');
    expect(night.durationMs).toBe(11 * hourMs);
    const readTimesMs = ['2026-03-28T10:00', '2026-03-28T14:00', '2026-03-28T18:00', '2026-03-28T22:20', '2026-03-29T03:30'].map((time) => at(`${time}:00Z`));
    const result = shiftReadAdherence({
      stayStartMs: at('2026-03-28T10:00:00Z'),
      readTimesMs,
      intervalHours: 4,
      shiftStartMs: night.startMs,
      shiftEndMs: night.endMs,
      nowMs: night.endMs,
    });
    expect(result).toEqual({
      readsInShift: 3,
      dueSlots: [
        { dueMs: at('2026-03-28T18:00:00Z'), metByReadMs: at('2026-03-28T18:00:00Z'), lateByMs: 0, missed: false },
        { dueMs: at('2026-03-28T22:00:00Z'), metByReadMs: at('2026-03-28T22:20:00Z'), lateByMs: 0, missed: false },
        { dueMs: at('2026-03-29T02:20:00Z'), metByReadMs: at('2026-03-29T03:30:00Z'), lateByMs: 70 * minuteMs, missed: false },
      ],
      lateCount: 1,
      missedCount: 0,
    });
    // Four hours after 23:20 CET is 04:20 CEST on the ward clock, not 03:20.
    const wallClock = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/Berlin', hour: '2-digit', minute: '2-digit' });
    expect(result.dueSlots.map((slot) => wallClock.format(slot.dueMs))).toEqual(['19:00', '23:00', '04:20']);
  });

  it('leaves a due time still open (neither met nor missed) while its window runs past now', () => {
    const readTimesMs = [at('2026-03-10T01:00:00Z'), at('2026-03-10T05:00:00Z')];
    expect(shiftReadAdherence(adherence({ readTimesMs, nowMs: at('2026-03-10T09:50:00Z') }))).toEqual({
      readsInShift: 0,
      dueSlots: [{ dueMs: at('2026-03-10T09:00:00Z'), metByReadMs: null, lateByMs: 0, missed: false }],
      lateCount: 0,
      missedCount: 0,
    });
  });

  it('lists no due time later than now', () => {
    const readTimesMs = [at('2026-03-10T01:00:00Z'), at('2026-03-10T05:00:00Z'), at('2026-03-10T08:55:00Z')];
    expect(shiftReadAdherence(adherence({ readTimesMs, nowMs: at('2026-03-10T12:54:59Z') })).dueSlots).toEqual([
      { dueMs: at('2026-03-10T09:00:00Z'), metByReadMs: at('2026-03-10T08:55:00Z'), lateByMs: 0, missed: false },
    ]);
  });

  it('lets an early read or an extra read meet the due time and restart the clock', () => {
    // The 07:30 alarm read after the 07:00 routine read meets the 11:00 due time early and makes
    // 11:30 due; the 11:20 read meets that early in turn.
    const readTimesMs = ['03:00', '07:00', '07:30', '11:20'].map((time) => at(`2026-03-10T${time}:00Z`));
    expect(shiftReadAdherence(adherence({ stayStartMs: at('2026-03-10T03:00:00Z'), readTimesMs, nowMs: at('2026-03-10T13:00:00Z') })).dueSlots).toEqual([
      { dueMs: at('2026-03-10T07:00:00Z'), metByReadMs: at('2026-03-10T07:00:00Z'), lateByMs: 0, missed: false },
      { dueMs: at('2026-03-10T11:00:00Z'), metByReadMs: at('2026-03-10T07:30:00Z'), lateByMs: 0, missed: false },
      { dueMs: at('2026-03-10T11:30:00Z'), metByReadMs: at('2026-03-10T11:20:00Z'), lateByMs: 0, missed: false },
    ]);
  });

  it('marks a due time missed in its shift when the read only came after handover', () => {
    const readTimesMs = [at('2026-03-10T14:00:00Z'), at('2026-03-10T19:10:00Z')];
    const day = shiftReadAdherence(adherence({ stayStartMs: at('2026-03-10T14:00:00Z'), readTimesMs, nowMs: at('2026-03-10T20:00:00Z') }));
    expect(day.dueSlots).toEqual([
      { dueMs: at('2026-03-10T14:00:00Z'), metByReadMs: at('2026-03-10T14:00:00Z'), lateByMs: 0, missed: false },
      { dueMs: at('2026-03-10T18:00:00Z'), metByReadMs: null, lateByMs: 0, missed: true },
    ]);
    const night = shiftReadAdherence(
      adherence({
        stayStartMs: at('2026-03-10T14:00:00Z'),
        readTimesMs,
        shiftStartMs: at('2026-03-10T19:00:00Z'),
        shiftEndMs: at('2026-03-11T07:00:00Z'),
        nowMs: at('2026-03-10T23:10:00Z'),
      }),
    );
    expect(night).toEqual({
      readsInShift: 1,
      dueSlots: [{ dueMs: at('2026-03-10T23:10:00Z'), metByReadMs: null, lateByMs: 0, missed: false }],
      lateCount: 0,
      missedCount: 0,
    });
  });

  it('starts with the baseline read due at an admission mid-shift and lists nothing after discharge', () => {
    const result = shiftReadAdherence(
      adherence({ stayStartMs: at('2026-03-10T10:00:00Z'), stayEndMs: at('2026-03-10T15:00:00Z'), readTimesMs: [at('2026-03-10T10:45:00Z')] }),
    );
    expect(result).toEqual({
      readsInShift: 1,
      dueSlots: [
        { dueMs: at('2026-03-10T10:00:00Z'), metByReadMs: at('2026-03-10T10:45:00Z'), lateByMs: 45 * minuteMs, missed: false },
        { dueMs: at('2026-03-10T14:45:00Z'), metByReadMs: null, lateByMs: 0, missed: true },
      ],
      lateCount: 1,
      missedCount: 1,
    });
  });

  it('counts a read saved twice with the same strip time once', () => {
    const readTimesMs = [at('2026-03-10T01:00:00Z'), at('2026-03-10T05:00:00Z'), at('2026-03-10T09:00:00Z'), at('2026-03-10T09:00:00Z')];
    const result = shiftReadAdherence(adherence({ readTimesMs, nowMs: at('2026-03-10T12:00:00Z') }));
    expect(result.readsInShift).toBe(1);
    expect(result.dueSlots).toEqual([{ dueMs: at('2026-03-10T09:00:00Z'), metByReadMs: at('2026-03-10T09:00:00Z'), lateByMs: 0, missed: false }]);
  });

  it('keeps the four-hour rhythm of a stay left unread since admission a year ago', () => {
    const result = shiftReadAdherence(adherence({ stayStartMs: at('2025-03-10T03:00:00Z') }));
    expect(result.dueSlots.map((slot) => [new Date(slot.dueMs).toISOString(), slot.missed])).toEqual([
      ['2026-03-10T07:00:00.000Z', true],
      ['2026-03-10T11:00:00.000Z', true],
      ['2026-03-10T15:00:00.000Z', true],
    ]);
    expect(result.missedCount).toBe(3);
  });

  it('uses a unit-set grace period', () => {
    const readTimesMs = [at('2026-03-10T05:00:00Z'), at('2026-03-10T09:10:00Z')];
    const dueSlots = (graceMinutes: number) => shiftReadAdherence(adherence({ readTimesMs, graceMinutes, nowMs: at('2026-03-10T10:00:00Z') })).dueSlots;
    expect(dueSlots(10)[0]?.lateByMs).toBe(0);
    expect(dueSlots(5)[0]?.lateByMs).toBe(10 * minuteMs);
  });

  describe('edge cases', () => {
    it('refuses a shift that ends before it starts, a negative grace and NaN reads', () => {
      expect(() => shiftReadAdherence(adherence({ shiftEndMs: dayShift.shiftStartMs }))).toThrow('A shift must end after it starts.');
      expect(() => shiftReadAdherence(adherence({ graceMinutes: -5 }))).toThrow(ValidationError);
      expect(() => shiftReadAdherence(adherence({ readTimesMs: [Number.NaN] }))).toThrow(ValidationError);
    });

    it('lists nothing for a shift that has not begun or a stay that starts after it', () => {
      expect(shiftReadAdherence(adherence({ nowMs: dayShift.shiftStartMs - 1 })).dueSlots).toEqual([]);
      expect(shiftReadAdherence(adherence({ stayStartMs: dayShift.shiftEndMs })).dueSlots).toEqual([]);
    });
  });

  describe('properties', () => {
    it('lists due times in order, inside the shift, not after now, with counts that match', () => {
      fc.assert(
        fc.property(
          fc.array(fc.integer({ min: 0, max: 48 * 60 }), { maxLength: 25 }),
          fc.integer({ min: 0, max: 48 * 60 }),
          fc.integer({ min: 0, max: 48 * 60 }),
          fc.constantFrom(1, 2, 4, 6),
          (readMinutes, shiftStartMinute, nowMinute, intervalHours) => {
            const baseMs = at('2026-03-10T00:00:00Z');
            const shiftStartMs = baseMs + shiftStartMinute * minuteMs;
            const shiftEndMs = shiftStartMs + 12 * hourMs;
            const nowMs = baseMs + nowMinute * minuteMs;
            const result = shiftReadAdherence({
              stayStartMs: baseMs,
              readTimesMs: readMinutes.map((minute) => baseMs + minute * minuteMs),
              intervalHours,
              shiftStartMs,
              shiftEndMs,
              nowMs,
            });
            const dueTimesMs = result.dueSlots.map((slot) => slot.dueMs);
            expect(dueTimesMs).toEqual([...dueTimesMs].sort((a, b) => a - b));
            for (const slot of result.dueSlots) {
              expect(slot.dueMs).toBeGreaterThanOrEqual(shiftStartMs);
              expect(slot.dueMs).toBeLessThan(shiftEndMs);
              expect(slot.dueMs).toBeLessThanOrEqual(nowMs);
              expect(slot.missed && slot.metByReadMs !== null).toBe(false);
            }
            expect(result.lateCount).toBe(result.dueSlots.filter((slot) => slot.lateByMs > 0).length);
            expect(result.missedCount).toBe(result.dueSlots.filter((slot) => slot.missed).length);
          },
        ),
      );
    });

    it('with no reads, lists exactly the admission time plus whole intervals that fall in the shift by now', () => {
      fc.assert(
        fc.property(
          fc.integer({ min: 0, max: 400 * 24 * 60 }),
          fc.constantFrom(1, 2, 4, 6, 8),
          fc.integer({ min: 0, max: 12 * 60 }),
          (minutesBeforeShift, intervalHours, minutesIntoShift) => {
            const shiftStartMs = at('2026-03-10T07:00:00Z');
            const stayStartMs2 = shiftStartMs - minutesBeforeShift * minuteMs;
            const nowMs = shiftStartMs + minutesIntoShift * minuteMs;
            const intervalMs = intervalHours * hourMs;
            const expected: number[] = [];
            for (let dueMs = stayStartMs2; dueMs < shiftStartMs + 12 * hourMs && dueMs <= nowMs; dueMs += intervalMs) {
              if (dueMs >= shiftStartMs) expected.push(dueMs);
            }
            const result = shiftReadAdherence({
              stayStartMs: stayStartMs2,
              readTimesMs: [],
              intervalHours,
              shiftStartMs,
              shiftEndMs: shiftStartMs + 12 * hourMs,
              nowMs,
            });
            expect(result.dueSlots.map((slot) => slot.dueMs)).toEqual(expected);
          },
        ),
      );
    });
  });
});
