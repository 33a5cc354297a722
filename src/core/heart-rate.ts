import { largeBoxesToMs, smallBoxesToMs } from './boxes-to-ms.ts';

const msPerMinute = 60_000;

/** Rate in beats per minute from one R-R interval in ms: 60 000 / RR (Guyton & Hall; Goldberger). */
export function rateFromRrMs(rrMs: number): number {
  return msPerMinute / rrMs;
}

/** R-R in ms for a rate in beats per minute (inverse of rateFromRrMs). */
export function rrMsFromRate(rateBpm: number): number {
  return msPerMinute / rateBpm;
}

/** "1500 rule" at 25 mm/s (3000 at 50 mm/s): rate from small boxes between two R waves. */
export function rateFromSmallBoxes(smallBoxes: number, paperSpeedMmPerS: number): number {
  return rateFromRrMs(smallBoxesToMs(smallBoxes, paperSpeedMmPerS));
}

/** "300 rule" at 25 mm/s (600 at 50 mm/s): rate from large boxes between two R waves. */
export function rateFromLargeBoxes(largeBoxes: number, paperSpeedMmPerS: number): number {
  return rateFromRrMs(largeBoxesToMs(largeBoxes, paperSpeedMmPerS));
}

/** Six-second method for irregular rhythms: QRS complexes in 6 s x 10 (nursing and teaching texts). */
export function rateFromSixSecondCount(qrsCount: number): number {
  return qrsCount * 10;
}
