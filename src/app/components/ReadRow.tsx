import { roundForDisplay } from '../../core/display-rounding.ts';
import { readReasonNames } from '../../core/records.ts';
import { rhythmLabel } from '../../core/rhythm-labels.ts';
import type { StoredRead } from '../../store/db.ts';
import type { DerivedRead } from '../../core/stay-reads.ts';
import { flagCounts } from '../board-rows.ts';
import { hrefOf } from '../routes.ts';
import { dayClockText } from '../time-text.ts';
import { SeverityMark } from './SeverityMark.tsx';

const ms = (v: number | null | undefined) => (v === null || v === undefined ? '—' : `${roundForDisplay(v)}`);
const syncWords = { pending: 'Waiting to send', accepted: 'On the unit server', rejected: 'Refused by the server' } as const;

/** One read in a bed's list: time, figures from the core, rhythm, reason, author, flags, sync state, amend link. */
export function ReadRow({ derived, stored, timeZone, mine }: { derived: DerivedRead; stored: StoredRead | undefined; timeZone: string; mine: boolean }) {
  const { view, analysis } = derived;
  const read = view.current;
  const counts = flagCounts(analysis?.flags ?? []);
  // A refused read offers its history and the refusal, never an amendment (the server never took the read).
  const refused = stored?.syncStatus === 'rejected';
  const label = read.counts.rhythmLabel ? rhythmLabel(read.counts.rhythmLabel).name : (read.rhythmText ?? '—');
  return (
    <tr>
      <th scope="row">{dayClockText(read.stripTimeMs, timeZone)}</th>
      <td>{analysis ? roundForDisplay(analysis.rate.rateBpm) : '—'}</td>
      <td>{ms(analysis?.intervals.prMs)}</td>
      <td>{ms(analysis?.intervals.qrsMs)}</td>
      <td>{ms(analysis?.intervals.qtMs)}</td>
      <td>{ms(analysis?.qtc?.forFlags.qtcMs)}</td>
      <td>
        {label}
        {read.ectopy ? <span class="sub"> · {read.ectopy}</span> : null}
      </td>
      <td>
        {readReasonNames[read.reason]}
        <span class="sub"> · {read.authorName}</span>
      </td>
      <td class="row-flags">
        {counts.urgent ? <SeverityMark severity="urgent" count={counts.urgent} /> : null}
        {counts.caution ? <SeverityMark severity="caution" count={counts.caution} /> : null}
        {counts.note ? <SeverityMark severity="note" count={counts.note} /> : null}
        {derived.errors.length > 0 ? <span class="problem-inline">Figures unavailable: {derived.errors[0]!.message}</span> : null}
      </td>
      <td>
        {view.amendments.length > 0 ? <span class="amended-tag">Amended ({view.amendments.length})</span> : null}
        {stored ? <span class={`sync sync-${stored.syncStatus}`}>{syncWords[stored.syncStatus]}{stored.rejectReason ? `: ${stored.rejectReason}` : ''}</span> : null}
        <a class="row-link" href={hrefOf({ screen: 'amend', readId: read.id })}>
          {refused ? 'Why refused, and history' : mine ? 'Amend or view history' : 'View history'}
        </a>
      </td>
    </tr>
  );
}
