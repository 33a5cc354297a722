import { loadBoardData } from '../../store/board-query.ts';
import { useCharting } from '../app-context.ts';
import type { BoardRow } from '../board-rows.ts';
import { boardRows, flagCounts } from '../board-rows.ts';
import { DecisionSupportNote } from '../components/DecisionSupportNote.tsx';
import { ScheduleBadge } from '../components/ScheduleBadge.tsx';
import { SeverityMark } from '../components/SeverityMark.tsx';
import { hrefOf } from '../routes.ts';
import { clockText } from '../time-text.ts';
import { useLiveQuery } from '../use-live-query.ts';
import { useNowMs } from '../use-now.ts';

/** The ward at a glance: every bed, those needing attention first. */
export function BedsBoard() {
  const { db, unit, policy, clinician } = useCharting();
  const nowMs = useNowMs();
  const data = useLiveQuery(() => loadBoardData(db, unit.id, clinician.id), [db, unit.id, clinician.id]);
  if (!data) return <p class="loading">Loading beds…</p>;
  const rows = boardRows(unit, data.beds, data.stays, policy, data.myDraftStayIds, nowMs);
  const needing = rows.filter((r) => r.attentionRank === 0).length;
  return (
    <section aria-labelledby="board-title">
      <div class="screen-head">
        <h1 id="board-title">Beds now</h1>
        <p class="screen-sub">
          {needing > 0 ? `${needing} ${needing === 1 ? 'bed needs' : 'beds need'} attention first (overdue or urgent)` : 'No bed is overdue or urgent'} · {clockText(nowMs, unit.timeZone)} ward time
        </p>
      </div>
      <DecisionSupportNote />
      {rows.length === 0 ? (
        <p class="empty-state">
          This ward has no beds yet. <a href={hrefOf({ screen: 'settings' })}>Add beds in Unit settings</a>.
        </p>
      ) : null}
      <ul class="board" aria-label="Beds">
        {rows.map((row) => (
          <BoardCard key={row.bed.id} row={row} timeZone={unit.timeZone} />
        ))}
      </ul>
    </section>
  );
}

function BoardCard({ row, timeZone }: { row: BoardRow; timeZone: string }) {
  const { bed, stay } = row;
  if (!stay) {
    return (
      <li class="bed-card bed-empty">
        <h2 class="bed-label">{bed.label}</h2>
        <p class="bed-alias">No patient monitored</p>
        <a class="button" href={hrefOf({ screen: 'start-monitoring', bedId: bed.id })}>
          Start monitoring
        </a>
      </li>
    );
  }
  const counts = flagCounts(row.flags);
  return (
    <li class={`bed-card rank-${row.attentionRank}`}>
      <a class="bed-open" href={hrefOf({ screen: 'bed', bedId: bed.id })} aria-label={`${bed.label}, ${stay.alias}: open the bed`}>
        <h2 class="bed-label">
          {bed.label} <span class="bed-alias">{stay.alias}</span>
        </h2>
        <p class="bed-rhythm">{row.rhythmName ?? 'No rhythm recorded yet'}</p>
        <p class="bed-last">Last read: {row.lastReadMs === null ? 'none yet' : clockText(row.lastReadMs, timeZone)}</p>
        {row.schedule ? <ScheduleBadge schedule={row.schedule} timeZone={timeZone} /> : null}
        <p class="bed-flags" aria-label="Open flags">
          {counts.urgent > 0 ? <SeverityMark severity="urgent" count={counts.urgent} /> : null}
          {counts.caution > 0 ? <SeverityMark severity="caution" count={counts.caution} /> : null}
          {counts.note > 0 ? <SeverityMark severity="note" count={counts.note} /> : null}
          {row.flags.length === 0 ? <span class="no-flags">{row.lastReadMs === null ? 'No reads yet' : 'No flags on the last read'}</span> : null}
        </p>
        {row.hasMyDraft ? <p class="draft-tag">Your unsigned draft</p> : null}
      </a>
      <a class="button button-primary bed-new-read" href={hrefOf({ screen: 'new-read', bedId: bed.id })}>
        {row.hasMyDraft ? 'Continue read' : 'New read'}
      </a>
    </li>
  );
}
