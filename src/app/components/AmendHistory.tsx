import type { ReadAnalysis } from '../../core/analyze-read.ts';
import { roundForDisplay } from '../../core/display-rounding.ts';
import type { Amendment, SignedRead } from '../../core/records.ts';
import { fieldLabel } from '../read-form-values.ts';
import { dayClockText } from '../time-text.ts';

function valueText(value: unknown, timeZone: string, key: string): string {
  if (value === undefined || value === '') return '(empty)';
  if (key === 'stripTimeMs' && typeof value === 'number') return dayClockText(value, timeZone);
  if (Array.isArray(value)) return value.join(', ');
  return String(value);
}

/** The read as signed, then each amendment in order: who, when, why, and what changed. */
export function AmendHistory({ read, amendments, originalAnalysis, timeZone }: { read: SignedRead; amendments: readonly Amendment[]; originalAnalysis: ReadAnalysis | null; timeZone: string }) {
  const c = read.counts;
  return (
    <section class="history" aria-label="History of this read">
      <h2>As signed</h2>
      <p>
        {dayClockText(read.stripTimeMs, timeZone)} strip, signed {dayClockText(read.signedAtMs, timeZone)} by {read.authorName}. Counts: R-R {c.rrSmallBoxes.join(', ') || '—'}
        {c.sixSecondQrsCount !== undefined ? `; six-second ${c.sixSecondQrsCount}` : ''}; PR {c.prSmallBoxes ?? '—'}; QRS {c.qrsSmallBoxes ?? '—'}; QT {c.qtSmallBoxes ?? '—'} small boxes at {c.paperSpeedMmPerS} mm/s.
        {originalAnalysis ? ` Figures: ${roundForDisplay(originalAnalysis.rate.rateBpm)} bpm${originalAnalysis.qtc ? `, QTc ${roundForDisplay(originalAnalysis.qtc.forFlags.qtcMs)} ms` : ''}.` : ''}
        {read.notes ? ` Notes: ${read.notes}` : ''}
      </p>
      {amendments.length > 0 ? <h2>Amendments</h2> : null}
      <ol>
        {amendments.map((a) => (
          <li key={a.id}>
            <strong>{dayClockText(a.createdAtMs, timeZone)}</strong> by {a.authorName}: “{a.reason}”.{' '}
            {Object.entries(a.changes)
              .filter(([, v]) => v !== undefined)
              .map(([k, v]) => `${fieldLabel(k)} → ${valueText(v, timeZone, k)}`)
              .join('; ')}
          </li>
        ))}
      </ol>
    </section>
  );
}
