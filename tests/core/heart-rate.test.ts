import { describe, expect, it } from 'vitest';
import { rateFromLargeBoxes, rateFromRrMs, rateFromSixSecondCount, rateFromSmallBoxes, rrMsFromRate } from '../../src/core/heart-rate.ts';

// Heart-rate examples: clinical reference §4a, from the 300 / 1500 rules (textbook fact, Guyton & Hall 2021;
// Goldberger 2018) and the 50 mm/s equivalents 600 / 3000 (teaching text on 25 vs 50 mm/s).
describe('rate from one R-R', () => {
  it('gives 75 bpm for 4 large boxes at 25 mm/s (300 / 4)', () => {
    expect(rateFromLargeBoxes(4, 25)).toBe(75);
  });
  it('gives 75 bpm for 20 small boxes at 25 mm/s (1500 / 20)', () => {
    expect(rateFromSmallBoxes(20, 25)).toBe(75);
  });
  it('gives 71.43 bpm for 21 small boxes at 25 mm/s (1500 / 21)', () => {
    expect(rateFromSmallBoxes(21, 25)).toBeCloseTo(71.428571, 5);
  });
  it('gives 125 bpm for 12 small boxes at 25 mm/s', () => {
    expect(rateFromSmallBoxes(12, 25)).toBe(125);
  });
  it('gives 42.86 bpm for 7 large boxes at 25 mm/s', () => {
    expect(rateFromLargeBoxes(7, 25)).toBeCloseTo(42.857143, 5);
  });
  it('gives 75 bpm for 8 large or 40 small boxes at 50 mm/s (600 / 8 = 3000 / 40), not 37.5', () => {
    expect(rateFromLargeBoxes(8, 50)).toBe(75);
    expect(rateFromSmallBoxes(40, 50)).toBe(75);
  });
  it('follows the countdown 300, 150, 100, 75, 60, 50 for 1 to 6 large boxes (common practice; teaching pages)', () => {
    expect([1, 2, 3, 4, 5, 6].map((n) => rateFromLargeBoxes(n, 25))).toEqual([300, 150, 100, 75, 60, 50]);
  });
  it('gives 60 bpm for an R-R of 1000 ms and back (60 000 / RR)', () => {
    expect(rateFromRrMs(1000)).toBe(60);
    expect(rrMsFromRate(75)).toBe(800);
  });
});

describe('six-second count', () => {
  it('gives 80 bpm for 8 QRS complexes in 6 s (count x 10; nursing texts)', () => {
    expect(rateFromSixSecondCount(8)).toBe(80);
  });
});
