import { roundForDisplay } from '../core/display-rounding.ts';
import type { Flag, FlagCode } from '../core/read-flags.ts';

/** What each flag is about, in a few plain words: the core's figure name alone cannot tell a QTc of 567 ms from a rise of 127 ms. */
export const flagNames: Record<FlagCode, string> = {
  'rate-low': 'Low rate',
  'rate-high': 'High rate',
  'rate-crossed-limit': 'Rate crossed a limit since the last read',
  'pr-short': 'Short PR',
  'pr-long': 'Long PR',
  'pr-marked': 'Markedly long PR',
  'pr-newly-long': 'PR newly long',
  'qrs-wide': 'Wide QRS',
  'qrs-newly-wide': 'QRS newly wide',
  'qtc-prolonged': 'Prolonged QTc',
  'qtc-short': 'Short QTc',
  'qtc-high-risk': 'High-risk QTc',
  'qtc-rise-from-baseline': 'QTc rise from baseline',
  'qtc-rise-since-last-read': 'QTc rise since the last read',
  'qtc-not-compared': 'QTc not compared with the last read',
  'adult-thresholds': 'Adult limits used',
};

const comparatorSigns: Record<Flag['limit']['comparator'], string> = { '<': '<', '>': '>', '>=': '≥', '<=': '≤' };

/** 'High-risk QTc 567 ms (limit ≥ 500 ms)': the flag's name, value and limit, for tables and paper. */
export function flagShortText(flag: Pick<Flag, 'code' | 'value' | 'unit' | 'limit'>): string {
  return `${flagNames[flag.code]} ${roundForDisplay(flag.value)} ${flag.unit} (limit ${comparatorSigns[flag.limit.comparator]} ${flag.limit.value} ${flag.unit})`;
}
