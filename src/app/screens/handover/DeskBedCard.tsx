import { SeverityMark } from '../../components/SeverityMark.tsx';
import { ScheduleBadge } from '../../components/ScheduleBadge.tsx';
import type { DeskRow } from '../../handover-desk-rows.ts';
import { hrefOf } from '../../routes.ts';
import { clockText } from '../../time-text.ts';
import { HandoverStatusChip } from './HandoverStatusChip.tsx';
import { TrendChart } from './TrendChart.tsx';

/** Who gave or received the handover and when, for the chip. */
export function handoverDetail(row: Pick<DeskRow, 'handover' | 'status'>, timeZone: string): string | undefined {
  const h = row.handover;
  if (!h) return undefined;
  if (row.status === 'acknowledged' && h.receivedAtMs !== undefined) return `by ${h.receivedByName ?? 'the receiving nurse'} at ${clockText(h.receivedAtMs, timeZone)}`;
  return `given by ${h.givenByName} at ${clockText(h.givenAtMs, timeZone)}`;
}

/** One bed on the handover desk: who, open flags by severity, schedule, handover status, and rate and QTc over 24 h. */
export function DeskBedCard({ row, timeZone, shiftKey, nowMs }: { row: DeskRow; timeZone: string; shiftKey: string; nowMs: number }) {
  const { bed, stay, summary, trend } = row;
  if (!stay) {
    return (
      <li class="desk-card desk-card-empty">
        <h2 class="desk-bed">{bed.label}</h2>
        <p class="sub">No patient monitored this shift</p>
      </li>
    );
  }
  const open = row.openFlags;
  const noOpenFlags = open.urgent + open.caution + open.note === 0;
  const latestLine = summary?.situation.find((s) => s.startsWith('Latest figures:'));
  return (
    <li class={`desk-card desk-rank-${row.attentionRank}`}>
      <a class="desk-open" href={hrefOf({ screen: 'handover-bed', bedId: bed.id, shiftKey })} aria-label={`${bed.label}, ${stay.alias}: open the handover`}>
        <h2 class="desk-bed">
          {bed.label} <span class="desk-alias">{stay.alias}</span>
        </h2>
        <HandoverStatusChip status={row.status} detail={handoverDetail(row, timeZone)} />
        {summary?.changedSinceWritten ? (
          <p class="changed-tag">
            <strong>Changed since written:</strong> {summary.changesSinceWritten.length} {summary.changesSinceWritten.length === 1 ? 'read' : 'reads'} new or amended
          </p>
        ) : null}
        <p class="desk-flags" aria-label="Open flags">
          {open.urgent > 0 ? <SeverityMark severity="urgent" count={open.urgent} /> : null}
          {open.caution > 0 ? <SeverityMark severity="caution" count={open.caution} /> : null}
          {open.note > 0 ? <SeverityMark severity="note" count={open.note} /> : null}
          {noOpenFlags ? <span class="no-flags">No open flags</span> : null}
        </p>
        {summary ? <ScheduleBadge schedule={summary.schedule} timeZone={timeZone} /> : null}
        {summary && summary.readsInShift === 0 ? <p class="desk-note">No read this shift</p> : null}
        {summary?.stayStartedInShift ? <p class="desk-note">Monitoring began {clockText(stay.startMs, timeZone)}, part-way through the shift</p> : null}
        {latestLine ? <p class="desk-latest">{latestLine.replace('Latest figures: ', '')}</p> : null}
        {row.summaryProblem ? <p class="problem-inline">No summary: {row.summaryProblem}</p> : null}
      </a>
      {trend ? (
        <div class="desk-trends">
          <TrendChart series={trend.rateBpm} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={timeZone} size="mini" shift={summary ? { startMs: summary.shiftStartMs, endMs: summary.shiftEndMs } : undefined} nowMs={nowMs} />
          <TrendChart series={trend.qtcMs} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={timeZone} size="mini" shift={summary ? { startMs: summary.shiftStartMs, endMs: summary.shiftEndMs } : undefined} nowMs={nowMs} />
        </div>
      ) : null}
    </li>
  );
}
