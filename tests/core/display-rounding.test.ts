import { describe, expect, it } from 'vitest';
import { roundForDisplay } from '../../src/core/display-rounding.ts';

// No published rounding rule exists (clinical reference §8.8): the app rounds half-up for display only.
describe('roundForDisplay', () => {
  it('rounds 462.5 up to 463 (example D, Hodges)', () => {
    expect(roundForDisplay(462.5)).toBe(463);
  });
  it('rounds 402.49 down to 402 and 581.38 to 581', () => {
    expect(roundForDisplay(402.49)).toBe(402);
    expect(roundForDisplay(581.38)).toBe(581);
  });
  it('keeps decimals when asked, absorbing binary error (1.005 -> 1.01)', () => {
    expect(roundForDisplay(71.428571, 1)).toBe(71.4);
    expect(roundForDisplay(1.005, 2)).toBe(1.01);
  });
  it('rounds negatives away from zero and never returns -0', () => {
    expect(roundForDisplay(-2.5)).toBe(-3);
    expect(Object.is(roundForDisplay(-0.4), 0)).toBe(true);
    expect(Object.is(roundForDisplay(-0), 0)).toBe(true);
  });
});
