import type { FlagCode } from './read-flags.ts';

/** The derived figures a read reports that limits apply to. */
export type FlagFigure = 'rateBpm' | 'prMs' | 'qrsMs' | 'qtcMs';
/** Trend series are drawn for the same figures. */
export type TrendFigure = FlagFigure;

const flagFigure: Record<FlagCode, FlagFigure | null> = {
  'rate-low': 'rateBpm',
  'rate-high': 'rateBpm',
  'rate-crossed-limit': 'rateBpm',
  'pr-short': 'prMs',
  'pr-long': 'prMs',
  'pr-marked': 'prMs',
  'pr-newly-long': 'prMs',
  'qrs-wide': 'qrsMs',
  'qrs-newly-wide': 'qrsMs',
  'qtc-prolonged': 'qtcMs',
  'qtc-short': 'qtcMs',
  'qtc-high-risk': 'qtcMs',
  'qtc-rise-from-baseline': 'qtcMs',
  'qtc-rise-since-last-read': 'qtcMs',
  'qtc-not-compared': null,
  'adult-thresholds': null,
};

/** The figure a flag concerns, or null for flags about the read as a whole. */
export function figureOfFlag(code: FlagCode): FlagFigure | null {
  return flagFigure[code];
}
