import { describe, expect, it } from 'vitest';
import { countsFromForm, fieldLabel, messageInWords, parseTypedCount, stripTimeOf } from '../../src/app/read-form-values.ts';
import { emptyForm } from '../store/fixtures.ts';

describe('parseTypedCount', () => {
  it.each([
    ['4', 4],
    ['4.5', 4.5],
    ['4,5', 4.5],
    ['4½', 4.5],
    [' 12 ', 12],
    ['4.', 4],
    ['.5', 0.5],
  ])('reads "%s" as %s small boxes', (text, value) => {
    expect(parseTypedCount(text)).toBe(value);
  });
  it('reads blank as not entered', () => {
    expect(parseTypedCount('  ')).toBeUndefined();
  });
  it.each(['1o', '4..5', '-3', '.', 'abc', '1e3'])('reads "%s" as not a number', (text) => {
    expect(parseTypedCount(text)).toBeNaN();
  });
});

describe('countsFromForm', () => {
  it('keeps blank R-R rows out and names rows whose text is not a number by their position', () => {
    const { counts, errors } = countsFromForm({ ...emptyForm, rrSmallBoxes: ['20', '', 'x', '21'] });
    expect(counts.rrSmallBoxes).toEqual([20, 21]);
    expect(errors).toEqual([{ field: 'rrSmallBoxes[2]', message: 'R-R count 3: "x" is not a number; type small boxes, e.g. 20 or 20.5.' }]);
  });
  it('asks for a whole number in the six-second count', () => {
    expect(countsFromForm({ ...emptyForm, sixSecondQrsCount: 'ten' }).errors[0]?.message).toBe('Six-second QRS count: "ten" is not a number; type a whole number, e.g. 8.');
  });
});

describe('messageInWords', () => {
  it('starts a core message with the field in plain words and keeps the allowed range', () => {
    expect(messageInWords({ field: 'qtSmallBoxes', message: 'qtSmallBoxes must be between 3 and 25 small boxes at 25 mm/s (120-1000 ms); got 30' })).toBe(
      'QT count: must be between 3 and 25 small boxes at 25 mm/s (120-1000 ms); got 30',
    );
  });
  it('names an indexed count by its position from one', () => {
    expect(fieldLabel('rrSmallBoxes[0]')).toBe('R-R count 1');
    expect(messageInWords({ field: 'rrSmallBoxes[1]', message: 'rrSmallBoxes[1] must be between 4 and 150 small boxes' })).toBe('R-R count 2: must be between 4 and 150 small boxes');
  });
});

describe('stripTimeOf', () => {
  it('reads the ward clock in the unit time zone (London is UTC+1 in summer)', () => {
    const result = stripTimeOf({ ...emptyForm, stripLocalDate: '2026-07-01', stripLocalTime: '09:30' }, 'Europe/London');
    expect(result).toEqual({ ok: true, ms: Date.UTC(2026, 6, 1, 8, 30) });
  });
  it('names the strip time when the time is missing', () => {
    const result = stripTimeOf({ ...emptyForm, stripLocalTime: '' }, 'Europe/London');
    expect(result.ok).toBe(false);
    expect(!result.ok && result.error.message).toMatch(/^Strip time:/);
  });
});
