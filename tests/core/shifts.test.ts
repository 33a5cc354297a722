import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import type { ShiftPattern } from '../../src/core/shifts.ts';
import {
  localDateAt,
  localDateTimeToEpochMs,
  nextShift,
  previousShift,
  shiftAt,
  shiftsOverlapping,
  validateShiftPattern,
} from '../../src/core/shifts.ts';

// Patterns are unit policy (common practice, no source). Expected instants come from the
// published rules for 2026: the EU changes clocks on the last Sundays of March and October
// at 01:00 UTC (29 March, 25 October); the US on the second Sunday of March and the first
// Sunday of November at 02:00 local (8 March, 1 November).
const berlin = 'Europe/Berlin';
const chicago = 'America/Chicago';
const twelveHour: ShiftPattern = {
  shifts: [
    { name: 'Day', startLocalTime: '07:00' },
    { name: 'Night', startLocalTime: '19:00' },
  ],
};
const eightHour: ShiftPattern = {
  shifts: [
    { name: 'Early', startLocalTime: '07:00' },
    { name: 'Late', startLocalTime: '15:00' },
    { name: 'Night', startLocalTime: '23:00' },
  ],
};
const midnightStart: ShiftPattern = {
  shifts: [
    { name: 'Night', startLocalTime: '00:00' },
    { name: 'Day', startLocalTime: '08:00' },
    { name: 'Evening', startLocalTime: '16:00' },
  ],
};
const hourMs = 3_600_000;
const at = (iso: string): number => Date.parse(iso);
const summary = (pattern: ShiftPattern, timeZone: string) => (atMs: number) => {
  const shift = shiftAt(atMs, pattern, timeZone);
  return { key: shift.key, start: new Date(shift.startMs).toISOString(), end: new Date(shift.endMs).toISOString(), hours: shift.durationMs / hourMs };
};

describe('the runtime time zone data these tests pin', () => {
  // DST expectations are only meaningful with full ICU zone data; fail loudly rather than skip.
  it('knows Berlin and Chicago offsets either side of the 2026 changes', () => {
    expect(localDateAt(at('2026-03-29T00:59:59Z'), berlin)).toBe('2026-03-29');
    expect(localDateTimeToEpochMs('2026-03-28', '12:00', berlin)).toBe(at('2026-03-28T11:00:00Z'));
    expect(localDateTimeToEpochMs('2026-03-29', '12:00', berlin)).toBe(at('2026-03-29T10:00:00Z'));
    expect(localDateTimeToEpochMs('2026-03-07', '12:00', chicago)).toBe(at('2026-03-07T18:00:00Z'));
    expect(localDateTimeToEpochMs('2026-03-08', '12:00', chicago)).toBe(at('2026-03-08T17:00:00Z'));
  });
});

describe('shiftAt with 2 x 12 h shifts', () => {
  it('gives an 11 h Berlin night when clocks go forward (19:00 CET to 07:00 CEST)', () => {
    const shift = shiftAt(at('2026-03-28T23:00:00Z'), twelveHour, berlin);
    expect(shift).toEqual({
      name: 'Night',
      index: 1,
      startMs: at('2026-03-28T18:00:00Z'),
      endMs: at('2026-03-29T05:00:00Z'),
      durationMs: 11 * hourMs,
      startLocalDate: '2026-03-28',
      key: '2026-03-28/Night',
    });
  });

  it('gives a 13 h Berlin night when clocks go back (19:00 CEST to 07:00 CET)', () => {
    expect(summary(twelveHour, berlin)(at('2026-10-25T03:00:00Z'))).toEqual({
      key: '2026-10-24/Night',
      start: '2026-10-24T17:00:00.000Z',
      end: '2026-10-25T06:00:00.000Z',
      hours: 13,
    });
  });

  it('gives an 11 h Chicago night on 7-8 March and a 13 h one on 31 October-1 November', () => {
    expect(summary(twelveHour, chicago)(at('2026-03-08T09:00:00Z'))).toEqual({
      key: '2026-03-07/Night',
      start: '2026-03-08T01:00:00.000Z',
      end: '2026-03-08T12:00:00.000Z',
      hours: 11,
    });
    expect(summary(twelveHour, chicago)(at('2026-11-01T09:00:00Z'))).toEqual({
      key: '2026-10-31/Night',
      start: '2026-11-01T00:00:00.000Z',
      end: '2026-11-01T13:00:00.000Z',
      hours: 13,
    });
  });

  it('keeps the day shift after a change at 12 h', () => {
    expect(summary(twelveHour, berlin)(at('2026-03-29T12:00:00Z'))).toEqual({
      key: '2026-03-29/Day',
      start: '2026-03-29T05:00:00.000Z',
      end: '2026-03-29T17:00:00.000Z',
      hours: 12,
    });
  });

  it('puts 02:00 local in the night shift that started the evening before (midnight crossing)', () => {
    expect(summary(twelveHour, berlin)(at('2026-03-10T01:00:00Z'))).toEqual({
      key: '2026-03-09/Night',
      start: '2026-03-09T18:00:00.000Z',
      end: '2026-03-10T06:00:00.000Z',
      hours: 12,
    });
  });

  it('puts a shift start in the new shift and the millisecond before it in the old one', () => {
    const dayStartMs = at('2026-03-10T06:00:00Z');
    expect(shiftAt(dayStartMs, twelveHour, berlin).key).toBe('2026-03-10/Day');
    expect(shiftAt(dayStartMs - 1, twelveHour, berlin).key).toBe('2026-03-09/Night');
  });

  it('does not depend on the tablet time zone: the same instant gives Chicago wall-clock shifts', () => {
    // 18:00 UTC on 10 March is 19:00 in Berlin (night) and 13:00 in Chicago (day).
    expect(shiftAt(at('2026-03-10T18:00:00Z'), twelveHour, berlin).key).toBe('2026-03-10/Night');
    expect(shiftAt(at('2026-03-10T18:00:00Z'), twelveHour, chicago).key).toBe('2026-03-10/Day');
  });
});

describe('shiftAt with 3 x 8 h shifts', () => {
  it('gives a 7 h night and 8 h early and late shifts over the Berlin spring change', () => {
    const shifts = shiftsOverlapping(at('2026-03-28T14:00:00Z'), at('2026-03-29T14:00:00Z'), eightHour, berlin);
    expect(shifts.map((shift) => [shift.key, shift.durationMs / hourMs])).toEqual([
      ['2026-03-28/Late', 8],
      ['2026-03-28/Night', 7],
      ['2026-03-29/Early', 8],
      ['2026-03-29/Late', 8],
    ]);
    expect(shifts[1]?.startMs).toBe(at('2026-03-28T22:00:00Z'));
    expect(shifts[1]?.endMs).toBe(at('2026-03-29T05:00:00Z'));
  });

  it('gives a 9 h night over the Berlin autumn change', () => {
    expect(summary(eightHour, berlin)(at('2026-10-25T01:30:00Z'))).toEqual({
      key: '2026-10-24/Night',
      start: '2026-10-24T21:00:00.000Z',
      end: '2026-10-25T06:00:00.000Z',
      hours: 9,
    });
  });

  it('gives a 7 h night in spring and a 9 h night in autumn in Chicago', () => {
    expect(summary(eightHour, chicago)(at('2026-03-08T08:30:00Z'))).toEqual({
      key: '2026-03-07/Night',
      start: '2026-03-08T05:00:00.000Z',
      end: '2026-03-08T12:00:00.000Z',
      hours: 7,
    });
    expect(summary(eightHour, chicago)(at('2026-11-01T07:30:00Z'))).toEqual({
      key: '2026-10-31/Night',
      start: '2026-11-01T04:00:00.000Z',
      end: '2026-11-01T13:00:00.000Z',
      hours: 9,
    });
  });
});

describe('shiftAt with a shift starting at 00:00', () => {
  it('starts the night shift exactly at local midnight and ends the evening shift there', () => {
    const midnightMs = at('2026-03-09T23:00:00Z'); // 00:00 on 10 March in Berlin (CET)
    expect(shiftAt(midnightMs, midnightStart, berlin)).toMatchObject({ key: '2026-03-10/Night', index: 0, startMs: midnightMs });
    expect(shiftAt(midnightMs - 1, midnightStart, berlin)).toMatchObject({ key: '2026-03-09/Evening', index: 2, endMs: midnightMs });
  });

  it('gives a 7 h midnight shift when Chicago springs forward at 02:00', () => {
    expect(summary(midnightStart, chicago)(at('2026-03-08T07:00:00Z'))).toEqual({
      key: '2026-03-08/Night',
      start: '2026-03-08T06:00:00.000Z',
      end: '2026-03-08T13:00:00.000Z',
      hours: 7,
    });
  });
});

describe('start times the clock change skips or repeats', () => {
  const halfPastTwo: ShiftPattern = {
    shifts: [
      { name: 'Small hours', startLocalTime: '02:30' },
      { name: 'Afternoon', startLocalTime: '14:30' },
    ],
  };

  it('starts a 02:30 shift that does not exist at the moment the clocks jump (03:00 local)', () => {
    expect(summary(halfPastTwo, berlin)(at('2026-03-29T03:00:00Z'))).toEqual({
      key: '2026-03-29/Small hours',
      start: '2026-03-29T01:00:00.000Z',
      end: '2026-03-29T12:30:00.000Z',
      hours: 11.5,
    });
    expect(summary(halfPastTwo, chicago)(at('2026-03-08T09:00:00Z')).start).toBe('2026-03-08T08:00:00.000Z');
  });

  it('ends the shift before a skipped start at that same moment, leaving no gap', () => {
    expect(summary(halfPastTwo, berlin)(at('2026-03-29T00:59:59.999Z'))).toEqual({
      key: '2026-03-28/Afternoon',
      start: '2026-03-28T13:30:00.000Z',
      end: '2026-03-29T01:00:00.000Z',
      hours: 11.5,
    });
  });

  it('starts a 02:30 shift that happens twice at the earlier instant (still summer time)', () => {
    expect(summary(halfPastTwo, berlin)(at('2026-10-25T01:00:00Z'))).toEqual({
      key: '2026-10-25/Small hours',
      start: '2026-10-25T00:30:00.000Z',
      end: '2026-10-25T13:30:00.000Z',
      hours: 13,
    });
    expect(localDateTimeToEpochMs('2026-11-01', '01:30', chicago)).toBe(at('2026-11-01T06:30:00Z'));
  });

  it('gives no time to a shift whose start and the next start both fall in the gap', () => {
    const bothInGap: ShiftPattern = {
      shifts: [
        { name: 'A', startLocalTime: '02:15' },
        { name: 'B', startLocalTime: '02:45' },
        { name: 'C', startLocalTime: '12:00' },
      ],
    };
    // C from 12:00 CET (11:00 UTC) to the jump at 01:00 UTC; B from the jump to 12:00 CEST (10:00 UTC).
    const shifts = shiftsOverlapping(at('2026-03-28T20:00:00Z'), at('2026-03-29T10:00:00Z'), bothInGap, berlin);
    expect(shifts.map((shift) => [shift.key, shift.durationMs / hourMs])).toEqual([
      ['2026-03-28/C', 14],
      ['2026-03-29/B', 9],
    ]);
  });
});

describe('shiftsOverlapping', () => {
  it('lists the four 2 x 12 h shifts of the Berlin spring weekend, 47 h in all', () => {
    const fromMs = at('2026-03-28T06:00:00Z'); // Saturday 07:00 CET
    const toMs = at('2026-03-30T05:00:00Z'); // Monday 07:00 CEST
    const shifts = shiftsOverlapping(fromMs, toMs, twelveHour, berlin);
    expect(shifts.map((shift) => [shift.key, shift.durationMs / hourMs])).toEqual([
      ['2026-03-28/Day', 12],
      ['2026-03-28/Night', 11],
      ['2026-03-29/Day', 12],
      ['2026-03-29/Night', 12],
    ]);
    expect(shifts.reduce((totalMs, shift) => totalMs + shift.durationMs, 0)).toBe(toMs - fromMs);
  });

  it('lists the Chicago autumn weekend with its 13 h night', () => {
    const shifts = shiftsOverlapping(at('2026-10-31T12:00:00Z'), at('2026-11-02T13:00:00Z'), twelveHour, chicago);
    expect(shifts.map((shift) => [shift.key, shift.durationMs / hourMs])).toEqual([
      ['2026-10-31/Day', 12],
      ['2026-10-31/Night', 13],
      ['2026-11-01/Day', 12],
      ['2026-11-01/Night', 12],
    ]);
  });

  it('includes a shift the range starts inside and excludes one that starts at the range end', () => {
    const shifts = shiftsOverlapping(at('2026-03-10T12:00:00Z'), at('2026-03-10T18:00:00Z'), twelveHour, berlin);
    expect(shifts.map((shift) => shift.key)).toEqual(['2026-03-10/Day']);
  });

  it('gives nothing for an empty or reversed range', () => {
    expect(shiftsOverlapping(at('2026-03-10T12:00:00Z'), at('2026-03-10T12:00:00Z'), twelveHour, berlin)).toEqual([]);
    expect(shiftsOverlapping(at('2026-03-10T12:00:00Z'), at('2026-03-10T11:00:00Z'), twelveHour, berlin)).toEqual([]);
  });
});

describe('previousShift and nextShift', () => {
  it('step from the 11 h Berlin night to the day shifts either side of it', () => {
    const night = shiftAt(at('2026-03-28T23:00:00Z'), twelveHour, berlin);
    expect(previousShift(night, twelveHour, berlin)).toMatchObject({ key: '2026-03-28/Day', endMs: night.startMs, durationMs: 12 * hourMs });
    expect(nextShift(night, twelveHour, berlin)).toMatchObject({ key: '2026-03-29/Day', startMs: night.endMs, durationMs: 12 * hourMs });
  });

  it('step across midnight in a 3 x 8 h pattern', () => {
    const night = shiftAt(at('2026-03-10T23:00:00Z'), eightHour, berlin);
    expect(night.key).toBe('2026-03-10/Night');
    expect(nextShift(night, eightHour, berlin).key).toBe('2026-03-11/Early');
    expect(previousShift(night, eightHour, berlin).key).toBe('2026-03-10/Late');
  });
});

describe('validateShiftPattern', () => {
  it('accepts 2 x 12 h, 3 x 8 h and a single 24 h shift', () => {
    expect(validateShiftPattern(twelveHour)).toEqual([]);
    expect(validateShiftPattern(eightHour)).toEqual([]);
    expect(validateShiftPattern({ shifts: [{ name: 'All day', startLocalTime: '08:00' }] })).toEqual([]);
  });

  it('asks for at least one shift', () => {
    expect(validateShiftPattern({ shifts: [] })).toEqual(['A shift pattern needs at least one shift.']);
  });

  it('names each badly written time, empty name, repeated name and out-of-order start', () => {
    expect(
      validateShiftPattern({
        shifts: [
          { name: 'Early', startLocalTime: '7:00' },
          { name: '', startLocalTime: '15:00' },
          { name: 'Late', startLocalTime: '24:00' },
          { name: 'Night', startLocalTime: '23:00' },
          { name: 'Night', startLocalTime: '22:00' },
        ],
      }),
    ).toEqual([
      'Shift "Early" start time "7:00" is not HH:mm (24-hour, e.g. 07:00).',
      'Shift 2 has no name.',
      'Shift "Late" start time "24:00" is not HH:mm (24-hour, e.g. 07:00).',
      'Shift name "Night" is used more than once.',
      'Shift "Night" starts at 22:00, not after Shift "Night" at 23:00; list shifts in order through the day with distinct start times.',
    ]);
  });

  it('refuses two shifts starting at the same time', () => {
    expect(
      validateShiftPattern({
        shifts: [
          { name: 'Day', startLocalTime: '07:00' },
          { name: 'Twilight', startLocalTime: '07:00' },
        ],
      }),
    ).toEqual(['Shift "Twilight" starts at 07:00, not after Shift "Day" at 07:00; list shifts in order through the day with distinct start times.']);
  });

  it('makes shiftAt throw a ValidationError carrying the problems', () => {
    expect(() => shiftAt(0, { shifts: [] }, berlin)).toThrow(ValidationError);
    expect(() => shiftAt(0, { shifts: [{ name: 'Day', startLocalTime: '7' }] }, berlin)).toThrow(
      expect.objectContaining({
        errors: [{ field: 'shifts[0].startLocalTime', message: 'Shift "Day" start time "7" is not HH:mm (24-hour, e.g. 07:00).' }],
      }),
    );
  });
});

describe('edge cases', () => {
  it('refuses an unknown or empty time zone rather than using the tablet zone', () => {
    expect(() => shiftAt(0, twelveHour, 'Europe/Atlantis')).toThrow('"Europe/Atlantis" is not a known IANA time zone (e.g. Europe/Berlin).');
    expect(() => shiftAt(0, twelveHour, '')).toThrow(ValidationError);
  });

  it('refuses NaN and infinite instants', () => {
    expect(() => shiftAt(Number.NaN, twelveHour, berlin)).toThrow('atMs must be a finite time in epoch milliseconds.');
    expect(() => shiftsOverlapping(0, Number.POSITIVE_INFINITY, twelveHour, berlin)).toThrow(ValidationError);
  });

  it('treats -0 as the epoch', () => {
    expect(shiftAt(-0, twelveHour, 'UTC')).toMatchObject({ key: '1969-12-31/Night', startMs: -5 * hourMs, endMs: 7 * hourMs });
  });

  it('refuses a local date that is not on the calendar', () => {
    expect(() => localDateTimeToEpochMs('2026-02-30', '07:00', berlin)).toThrow(ValidationError);
  });
});

describe('properties', () => {
  const instantMs = fc.integer({ min: at('2000-01-01T00:00:00Z'), max: at('2040-01-01T00:00:00Z') });
  const patterns = fc.constantFrom(twelveHour, eightHour, midnightStart);
  const zones = fc.constantFrom(berlin, chicago);

  it('shiftAt(t) contains t', () => {
    fc.assert(
      fc.property(instantMs, patterns, zones, (atMs, pattern, timeZone) => {
        const shift = shiftAt(atMs, pattern, timeZone);
        expect(shift.startMs).toBeLessThanOrEqual(atMs);
        expect(shift.endMs).toBeGreaterThan(atMs);
        expect(shift.durationMs).toBe(shift.endMs - shift.startMs);
        expect(shift.key).toBe(`${shift.startLocalDate}/${shift.name}`);
      }),
    );
  });

  it('consecutive shifts tile time with no gap or overlap, and each lasts within an hour of its wall-clock length', () => {
    fc.assert(
      fc.property(instantMs, patterns, zones, (atMs, pattern, timeZone) => {
        const shift = shiftAt(atMs, pattern, timeZone);
        const next = nextShift(shift, pattern, timeZone);
        const previous = previousShift(shift, pattern, timeZone);
        expect(next.startMs).toBe(shift.endMs);
        expect(previous.endMs).toBe(shift.startMs);
        expect(previousShift(next, pattern, timeZone)).toEqual(shift);
        const wallHours = pattern === twelveHour ? 12 : 8;
        expect(Math.abs(shift.durationMs - wallHours * hourMs)).toBeLessThanOrEqual(hourMs);
      }),
    );
  });
});
