import { useState } from 'preact/hooks';
import type { ReadAnalysis } from '../../core/analyze-read.ts';
import { roundForDisplay } from '../../core/display-rounding.ts';
import { DecisionSupportNote } from './DecisionSupportNote.tsx';

const ms = (v: number | null | undefined) => (v === null || v === undefined ? '—' : `${roundForDisplay(v)} ms`);

/** The derived figures of a read, from the core: rate and how it was found, intervals, QTc by the unit's formula first. */
export function FiguresPanel({ analysis }: { analysis: ReadAnalysis | null }) {
  const [allFormulas, setAllFormulas] = useState(false);
  if (!analysis) {
    return (
      <section class="figures figures-empty" aria-label="Derived figures">
        <p>Figures appear here as you enter counts.</p>
        <DecisionSupportNote />
      </section>
    );
  }
  const qtc = analysis.qtc;
  const first = qtc?.ordered[0];
  return (
    <section class="figures" aria-label="Derived figures" aria-live="polite">
      <dl class="figure-grid">
        <div class="figure figure-rate">
          <dt>Heart rate</dt>
          <dd data-testid="figure-rate">{roundForDisplay(analysis.rate.rateBpm)} bpm</dd>
          <dd class="figure-note">
            {analysis.rate.methodDescription}
            {analysis.rate.regularity !== 'unknown' ? ` · R-R ${analysis.rate.regularity}` : ''}
          </dd>
        </div>
        <div class="figure">
          <dt>PR</dt>
          <dd data-testid="figure-pr">{ms(analysis.intervals.prMs)}</dd>
        </div>
        <div class="figure">
          <dt>QRS</dt>
          <dd data-testid="figure-qrs">{ms(analysis.intervals.qrsMs)}</dd>
        </div>
        <div class="figure">
          <dt>QT</dt>
          <dd data-testid="figure-qt">{ms(analysis.intervals.qtMs)}</dd>
        </div>
        <div class="figure figure-qtc">
          <dt>QTc{first ? `, ${first.name}` : ''}</dt>
          <dd data-testid="figure-qtc">{first ? ms(first.qtcMs) : '—'}</dd>
          {qtc ? <dd class="figure-note">Corrected with {qtc.rrUsedDescription}{qtc.approximate ? ' (approximate)' : ''}</dd> : null}
        </div>
        {analysis.atrialRate ? (
          <div class="figure">
            <dt>Atrial rate</dt>
            <dd>{roundForDisplay(analysis.atrialRate.meanRateBpm)} bpm</dd>
          </div>
        ) : null}
      </dl>
      {qtc?.wideQrs ? (
        <p class="figure-wide">
          Wide QRS or paced: adjusted QTc (QT − 0.5 × QRS) {ms(qtc.wideQrs.modifiedQtcMs)} · JT {ms(qtc.wideQrs.jtMs)} · JTc {ms(qtc.wideQrs.jtcMs)}. Limits are compared with: {qtc.forFlags.figure}.
        </p>
      ) : null}
      {qtc && qtc.warnings.length > 0 ? (
        <ul class="qtc-warnings" aria-label="QTc cautions">
          {qtc.warnings.map((w) => (
            <li key={w.code}>{w.message}</li>
          ))}
        </ul>
      ) : null}
      {qtc ? (
        <div class="other-formulas">
          <button type="button" class="link-button" aria-expanded={allFormulas} onClick={() => setAllFormulas(!allFormulas)}>
            {allFormulas ? 'Hide other QTc formulas' : 'Show other QTc formulas'}
          </button>
          {allFormulas ? (
            <ul>
              {qtc.ordered.slice(1).map((f) => (
                <li key={f.formula}>
                  {f.name}: {ms(f.qtcMs)}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      <DecisionSupportNote />
    </section>
  );
}
