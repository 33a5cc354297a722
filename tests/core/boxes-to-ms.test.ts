import { describe, expect, it } from 'vitest';
import { largeBoxesToMs, mmToMv, msToSmallBoxes, smallBoxMs, smallBoxesToMs } from '../../src/core/boxes-to-ms.ts';

// Source: Guyton & Hall, Textbook of Medical Physiology 14th ed. (2021), normal ECG chapter (secondary to
// Kligfield et al. 2007, AHA/ACC/HRS Part I): at 25 mm/s a small box is 40 ms and a large box 200 ms;
// at 50 mm/s a small box is 20 ms and a large box 100 ms (ECG tutorial text). Gain: 10 mm/mV standard.
describe('boxes to milliseconds', () => {
  it('gives 40 ms for one small box at 25 mm/s', () => {
    expect(smallBoxMs(25)).toBe(40);
    expect(smallBoxesToMs(1, 25)).toBe(40);
  });
  it('gives 20 ms for one small box at 50 mm/s', () => {
    expect(smallBoxMs(50)).toBe(20);
    expect(smallBoxesToMs(1, 50)).toBe(20);
  });
  it('gives 200 ms for one large box at 25 mm/s and 100 ms at 50 mm/s', () => {
    expect(largeBoxesToMs(1, 25)).toBe(200);
    expect(largeBoxesToMs(1, 50)).toBe(100);
  });
  it('gives 1 s for 5 large boxes at 25 mm/s', () => {
    expect(largeBoxesToMs(5, 25)).toBe(1000);
  });
  it('takes half boxes: 2.5 small boxes at 25 mm/s is 100 ms', () => {
    expect(smallBoxesToMs(2.5, 25)).toBe(100);
  });
  it('gives 400 ms for a QT of 20 small boxes at 50 mm/s (clinical reference 4a, 50 mm/s case)', () => {
    expect(smallBoxesToMs(20, 50)).toBe(400);
  });
  it('converts ms back to small boxes', () => {
    expect(msToSmallBoxes(200, 25)).toBe(5);
    expect(msToSmallBoxes(200, 50)).toBe(10);
  });
});

describe('millimetres to millivolts', () => {
  // Kligfield et al. 2007 Part I; calibration texts: 10 mm/mV standard, 5 half, 20 double.
  it('gives 1 mV for 10 mm at standard gain', () => {
    expect(mmToMv(10, 10)).toBe(1);
  });
  it('gives 0.1 mV per small box at 10 mm/mV', () => {
    expect(mmToMv(1, 10)).toBeCloseTo(0.1, 12);
  });
  it('gives 2 mV for 10 mm at half standard (5 mm/mV) and 0.5 mV at double (20 mm/mV)', () => {
    expect(mmToMv(10, 5)).toBe(2);
    expect(mmToMv(10, 20)).toBe(0.5);
  });
});
