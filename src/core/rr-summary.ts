import { smallBoxesToMs } from './boxes-to-ms.ts';
import { rateFromRrMs } from './heart-rate.ts';
import type { RegularityRule } from './unit-policy.ts';

export type Regularity = 'regular' | 'irregular' | 'unknown';

/** Several R-R (or P-P) intervals summarised: each in ms, the mean, the rate range and the regularity verdict. */
export interface IntervalSeriesSummary {
  intervalsMs: number[];
  meanMs: number;
  /** Rate from the mean interval (60 000 / mean). */
  meanRateBpm: number;
  /** Lowest rate: from the longest interval. */
  lowestRateBpm: number;
  /** Highest rate: from the shortest interval. */
  highestRateBpm: number;
  /** Longest minus shortest interval. */
  spreadMs: number;
  spreadPercentOfMean: number;
  /** 'unknown' with a single interval: regularity needs at least two to compare. */
  regularity: Regularity;
}

/** Summarises interval counts in small boxes at the recorded paper speed; needs at least one count. */
export function summarizeIntervals(smallBoxes: readonly number[], paperSpeedMmPerS: number, rule: RegularityRule): IntervalSeriesSummary {
  if (smallBoxes.length === 0) throw new RangeError('summarizeIntervals needs at least one interval');
  const intervalsMs = smallBoxes.map((b) => smallBoxesToMs(b, paperSpeedMmPerS));
  const meanMs = intervalsMs.reduce((a, b) => a + b, 0) / intervalsMs.length;
  const longestMs = Math.max(...intervalsMs);
  const shortestMs = Math.min(...intervalsMs);
  const spreadMs = longestMs - shortestMs;
  const spreadPercentOfMean = (spreadMs / meanMs) * 100;
  let regularity: Regularity = 'unknown';
  if (intervalsMs.length >= 2) {
    // A tiny tolerance keeps a spread of exactly 2 boxes (80 ms) regular despite float error.
    const regular = spreadMs <= rule.maxSpreadMs + 1e-9 || spreadPercentOfMean <= rule.maxSpreadPercentOfMean + 1e-9;
    regularity = regular ? 'regular' : 'irregular';
  }
  return {
    intervalsMs,
    meanMs,
    meanRateBpm: rateFromRrMs(meanMs),
    lowestRateBpm: rateFromRrMs(longestMs),
    highestRateBpm: rateFromRrMs(shortestMs),
    spreadMs,
    spreadPercentOfMean,
    regularity,
  };
}
