import type { ReadAnalysis } from '../../core/analyze-read.ts';
import { roundForDisplay } from '../../core/display-rounding.ts';
import { qtcFormulaShortNames } from '../../core/qtc.ts';
import { flagCounts } from '../board-rows.ts';
import { SeverityMark } from './SeverityMark.tsx';

/** On narrow screens, the figures stay in sight while typing: one sticky line, details and banners below. */
export function LiveSummaryBar({ analysis }: { analysis: ReadAnalysis | null }) {
  if (!analysis) return <div class="live-bar" aria-hidden="true">Figures appear as you type.</div>;
  const ms = (v: number | null | undefined) => (v === null || v === undefined ? '—' : roundForDisplay(v));
  const counts = flagCounts(analysis.flags);
  const qtc = analysis.qtc?.ordered[0];
  return (
    <div class="live-bar" aria-hidden="true">
      <span>{roundForDisplay(analysis.rate.rateBpm)} bpm</span>
      <span>PR {ms(analysis.intervals.prMs)}</span>
      <span>QRS {ms(analysis.intervals.qrsMs)}</span>
      <span>QT {ms(analysis.intervals.qtMs)}</span>
      <span>
        QTc {qtc ? `${ms(qtc.qtcMs)} (${qtcFormulaShortNames[qtc.formula]})` : '—'}
      </span>
      {counts.urgent ? <SeverityMark severity="urgent" count={counts.urgent} /> : null}
      {counts.caution ? <SeverityMark severity="caution" count={counts.caution} /> : null}
    </div>
  );
}
