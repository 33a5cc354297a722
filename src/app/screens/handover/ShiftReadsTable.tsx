import { roundForDisplay } from '../../../core/display-rounding.ts';
import { qtcFormulaShortNames } from '../../../core/qtc.ts';
import type { QtcFormula } from '../../../core/qtc.ts';
import { readReasonNames } from '../../../core/records.ts';
import { rhythmLabel } from '../../../core/rhythm-labels.ts';
import type { DerivedRead } from '../../../core/stay-reads.ts';
import { severityWords } from '../../components/SeverityMark.tsx';
import { flagShortText } from '../../handover-flag-text.ts';
import { clockText, dayClockText } from '../../time-text.ts';

const figure = (v: number | null | undefined) => (v === null || v === undefined ? '—' : String(roundForDisplay(v)));

/** The rhythm of a read as the nurse named it: the listed label, their free text, and any ectopy. */
export function rhythmOfRead(d: DerivedRead): string {
  const read = d.view.current;
  const parts = [read.counts.rhythmLabel ? rhythmLabel(read.counts.rhythmLabel).name : null, read.rhythmText ?? null, read.ectopy ? `ectopy: ${read.ectopy}` : null].filter((p): p is string => !!p);
  return parts.length > 0 ? parts.join('; ') : 'not named';
}

/**
 * A shift's reads with every figure from the core and its unit in the header: time, who, rate, PR,
 * QRS, QT, QTc by the unit's formula (with the adjusted value the limits used on a wide QRS), rhythm, flags.
 */
export function ShiftReadsTable({ reads, timeZone, formula, caption, withDates = false }: { reads: readonly DerivedRead[]; timeZone: string; formula: QtcFormula; caption: string; withDates?: boolean }) {
  return (
    <table class="reads shift-reads">
      <caption>{caption}</caption>
      <thead>
        <tr>
          <th scope="col">Strip time</th>
          <th scope="col">By</th>
          <th scope="col">Rate (bpm)</th>
          <th scope="col">PR (ms)</th>
          <th scope="col">QRS (ms)</th>
          <th scope="col">QT (ms)</th>
          <th scope="col">QTc (ms), {qtcFormulaShortNames[formula]}</th>
          <th scope="col">Rhythm</th>
          <th scope="col">Flags</th>
        </tr>
      </thead>
      <tbody>
        {reads.map((d) => {
          const a = d.analysis;
          const qtc = a?.qtc ?? null;
          return (
            <tr key={d.view.read.id}>
              <th scope="row">
                {withDates ? dayClockText(d.stripTimeMs, timeZone) : clockText(d.stripTimeMs, timeZone)}
                {d.view.amendments.length > 0 ? <span class="amended-tag">amended</span> : null}
                <span class="sub read-reason">{readReasonNames[d.view.current.reason]}</span>
              </th>
              <td>{d.view.read.authorName}</td>
              <td>{figure(a?.rate.rateBpm)}</td>
              <td>{figure(a?.intervals.prMs)}</td>
              <td>{figure(a?.intervals.qrsMs)}</td>
              <td>{figure(a?.intervals.qtMs)}</td>
              <td>
                {figure(qtc?.byFormula[formula])}
                {qtc?.approximate ? <span class="sub"> approx.</span> : null}
                {qtc?.forFlags.basis === 'modified-qt' ? <span class="sub qtc-adjusted"> limits used {figure(qtc.forFlags.qtcMs)} (QT − 0.5 × QRS)</span> : null}
              </td>
              <td>{rhythmOfRead(d)}</td>
              <td class="read-flags">
                {a === null ? <span class="problem-inline">Figures unavailable: {d.errors.map((e) => e.message).join('; ')}</span> : null}
                {a && a.flags.length === 0 ? '—' : null}
                {a?.flags.map((f) => (
                  <span key={f.code} class={`flag-word flag-${f.severity}`}>
                    {severityWords[f.severity]}: {flagShortText(f)}
                  </span>
                ))}
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
