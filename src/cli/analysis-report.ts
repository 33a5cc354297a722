import type { ReadAnalysis } from '../core/analyze-read.ts';
import { roundForDisplay } from '../core/display-rounding.ts';
import type { QtcFormula } from '../core/qtc.ts';
import { decisionSupportCaution } from './caution-text.ts';

/** Figures rounded for display (whole ms, whole bpm) with flat, unit-named keys; null where the read has no such figure. */
export interface DisplayFigures {
  rateBpm: number;
  meanRrMs: number | null;
  atrialRateBpm: number | null;
  prMs: number | null;
  qrsMs: number | null;
  qtMs: number | null;
  rrUsedForQtcMs: number | null;
  defaultQtcFormula: QtcFormula;
  qtcDefaultMs: number | null;
  qtcBazettMs: number | null;
  qtcFridericiaMs: number | null;
  qtcFraminghamMs: number | null;
  qtcHodgesMs: number | null;
  /** The QTc compared with the limits: plain, or adjusted for a wide QRS. */
  qtcForFlagsMs: number | null;
  jtMs: number | null;
  jtcMs: number | null;
  adjustedQtMs: number | null;
  adjustedQtcMs: number | null;
}

/** What `rhythm-ledger analyze` prints: the caution, the core's full unrounded analysis, and the rounded display figures. */
export type AnalysisReport = { caution: string } & ReadAnalysis & { display: DisplayFigures };

const shown = (value: number | null | undefined): number | null => (value === null || value === undefined ? null : roundForDisplay(value));

/** Rounded figures exactly as a screen shows them (rounding changes what is shown, never what is flagged). */
export function displayFigures(analysis: ReadAnalysis): DisplayFigures {
  const qtc = analysis.qtc;
  const wide = qtc?.wideQrs ?? null;
  return {
    rateBpm: roundForDisplay(analysis.rate.rateBpm),
    meanRrMs: shown(analysis.rate.rr?.meanMs),
    atrialRateBpm: shown(analysis.atrialRate?.meanRateBpm),
    prMs: shown(analysis.intervals.prMs),
    qrsMs: shown(analysis.intervals.qrsMs),
    qtMs: shown(analysis.intervals.qtMs),
    rrUsedForQtcMs: shown(qtc?.rrUsedMs),
    defaultQtcFormula: analysis.defaultQtcFormula,
    qtcDefaultMs: shown(qtc?.byFormula[analysis.defaultQtcFormula]),
    qtcBazettMs: shown(qtc?.byFormula.bazett),
    qtcFridericiaMs: shown(qtc?.byFormula.fridericia),
    qtcFraminghamMs: shown(qtc?.byFormula.framingham),
    qtcHodgesMs: shown(qtc?.byFormula.hodges),
    qtcForFlagsMs: shown(qtc?.forFlags.qtcMs),
    jtMs: shown(wide?.jtMs),
    jtcMs: shown(wide?.jtcMs),
    adjustedQtMs: shown(wide?.modifiedQtMs),
    adjustedQtcMs: shown(wide?.modifiedQtcMs),
  };
}

/** The full report for one analysed read. */
export function analysisReport(analysis: ReadAnalysis): AnalysisReport {
  return { caution: decisionSupportCaution, ...analysis, display: displayFigures(analysis) };
}
