import type { ReadAnalysis } from '../core/analyze-read.ts';
import type { FlagCode } from '../core/read-flags.ts';

/** The numeric figures a verification case may check, each named as its CSV column without the `expect_` prefix. */
export const verificationFigures = [
  'rate_bpm',
  'atrial_rate_bpm',
  'pr_ms',
  'qrs_ms',
  'qt_ms',
  'rr_used_ms',
  'qtc_bazett_ms',
  'qtc_fridericia_ms',
  'qtc_framingham_ms',
  'qtc_hodges_ms',
  'adjusted_qt_ms',
  'adjusted_qtc_ms',
  'jt_ms',
  'jtc_ms',
] as const;
export type VerificationFigure = (typeof verificationFigures)[number];

/** Which tolerance applies to a figure: rates use tolerance_bpm, durations tolerance_ms. */
export function figureUnit(figure: VerificationFigure): 'bpm' | 'ms' {
  return figure.endsWith('_bpm') ? 'bpm' : 'ms';
}

/** The unrounded figure as the core computed it, or null when the read has no such figure (e.g. no QT counted). */
export function actualFigure(figure: VerificationFigure, analysis: ReadAnalysis): number | null {
  const qtc = analysis.qtc;
  const wide = qtc?.wideQrs ?? null;
  switch (figure) {
    case 'rate_bpm':
      return analysis.rate.rateBpm;
    case 'atrial_rate_bpm':
      return analysis.atrialRate?.meanRateBpm ?? null;
    case 'pr_ms':
      return analysis.intervals.prMs;
    case 'qrs_ms':
      return analysis.intervals.qrsMs;
    case 'qt_ms':
      return analysis.intervals.qtMs;
    case 'rr_used_ms':
      return qtc?.rrUsedMs ?? null;
    case 'qtc_bazett_ms':
      return qtc?.byFormula.bazett ?? null;
    case 'qtc_fridericia_ms':
      return qtc?.byFormula.fridericia ?? null;
    case 'qtc_framingham_ms':
      return qtc?.byFormula.framingham ?? null;
    case 'qtc_hodges_ms':
      return qtc?.byFormula.hodges ?? null;
    case 'adjusted_qt_ms':
      return wide?.modifiedQtMs ?? null;
    case 'adjusted_qtc_ms':
      return wide?.modifiedQtcMs ?? null;
    case 'jt_ms':
      return wide?.jtMs ?? null;
    case 'jtc_ms':
      return wide?.jtcMs ?? null;
  }
}

/** Every flag code the core can raise, so a misspelt code in expect_flags is refused rather than silently failing. */
export const knownFlagCodes = [
  'rate-low',
  'rate-high',
  'rate-crossed-limit',
  'pr-short',
  'pr-long',
  'pr-marked',
  'pr-newly-long',
  'qrs-wide',
  'qrs-newly-wide',
  'qtc-prolonged',
  'qtc-short',
  'qtc-high-risk',
  'qtc-rise-from-baseline',
  'qtc-rise-since-last-read',
  'qtc-not-compared',
  'adult-thresholds',
] as const satisfies readonly FlagCode[];

// Fails to compile when the core gains a flag code this list lacks.
const everyFlagCodeListed: Exclude<FlagCode, (typeof knownFlagCodes)[number]> extends never ? true : false = true;
void everyFlagCodeListed;
