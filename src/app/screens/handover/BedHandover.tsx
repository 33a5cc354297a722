import { useMemo } from 'preact/hooks';
import { deriveStayReads } from '../../../core/stay-reads.ts';
import { useCharting } from '../../app-context.ts';
import { DecisionSupportNote } from '../../components/DecisionSupportNote.tsx';
import { StayFacts } from '../../components/StayFacts.tsx';
import { stayExportFile } from '../../handover-export.ts';
import { shiftText } from '../../handover-shift.ts';
import { hrefOf } from '../../routes.ts';
import { clockText, dayClockText } from '../../time-text.ts';
import { ChangedSinceWritten } from './ChangedSinceWritten.tsx';
import { handoverDetail } from './DeskBedCard.tsx';
import { ExportButtons } from './ExportButtons.tsx';
import { GiveHandoverForm } from './GiveHandoverForm.tsx';
import { HandoverStatusChip } from './HandoverStatusChip.tsx';
import { HandoverSummaryText } from './HandoverSummaryText.tsx';
import { ReceiveHandoverForm } from './ReceiveHandoverForm.tsx';
import { ShiftReadsTable } from './ShiftReadsTable.tsx';
import { TrendChart } from './TrendChart.tsx';
import { useHandoverRows } from './use-handover-rows.ts';

const syncWords = { pending: 'waiting to send to the unit server', accepted: 'on the unit server', rejected: 'refused by the unit server' } as const;

/** One bed at handover: the generated summary, the giving and receiving nurses, the full 24 h trend and the shift's reads. */
export function BedHandover({ bedId, shiftKey }: { bedId: string; shiftKey: string | null }) {
  const { unit, policy, demoWard } = useCharting();
  const { shift, nowMs, rows } = useHandoverRows(shiftKey);
  const row = rows?.find((r) => r.bed.id === bedId);
  const derived = useMemo(() => (row?.stay ? deriveStayReads(row.reads, row.amendments, row.stay, policy) : []), [row?.reads, row?.amendments, row?.stay, policy]);
  const deskHref = hrefOf({ screen: 'handover', shiftKey: shift.key });

  if (!rows) return <p class="loading">Opening the handover…</p>;
  if (!row) {
    return (
      <p>
        This bed is not on this tablet. <a href={deskHref}>Back to the handover desk</a>
      </p>
    );
  }
  const { bed, stay, summary, trend, handover } = row;
  if (!stay) {
    return (
      <section>
        <a class="back-link" href={deskHref}>
          Back to the handover desk
        </a>
        <h1>{bed.label}</h1>
        <p>No patient was monitored on this bed during the {shift.name} shift.</p>
      </section>
    );
  }
  const inShift = derived.filter((d) => d.stripTimeMs >= shift.startMs && d.stripTimeMs < shift.endMs);
  const shiftSpan = { startMs: shift.startMs, endMs: shift.endMs };
  return (
    <section class="bed-handover" aria-labelledby="handover-title">
      <a class="back-link" href={deskHref}>
        Back to the handover desk
      </a>
      <div class="screen-head">
        <h1 id="handover-title">
          Handover: {bed.label}, {stay.alias}
        </h1>
        <p class="screen-sub">{shiftText(shift, unit.timeZone)}</p>
        <HandoverStatusChip status={row.status} detail={handoverDetail(row, unit.timeZone)} />
        <StayFacts stay={stay} compact />
      </div>
      {row.summaryProblem ? <p class="problem">No summary could be written: {row.summaryProblem}</p> : null}
      {summary ? <ChangedSinceWritten summary={summary} /> : null}
      <DecisionSupportNote />

      <h2>Handover</h2>
      {handover ? (
        <div class="handover-record">
          <p>
            Given by <strong>{handover.givenByName}</strong> at {dayClockText(handover.givenAtMs, unit.timeZone)}
            {handover.receivedById !== undefined && handover.receivedAtMs !== undefined ? (
              <>
                ; received by <strong>{handover.receivedByName}</strong> at {dayClockText(handover.receivedAtMs, unit.timeZone)}
              </>
            ) : null}
            <span class={`sync sync-${handover.syncStatus}`}>
              {' '}
              · {demoWard ? 'kept on this tablet (demo ward)' : syncWords[handover.syncStatus]}
              {handover.rejectReason ? `: ${handover.rejectReason}` : ''}
            </span>
          </p>
          <blockquote class="nurse-text">{handover.nurseText === '' ? 'No words added by the giving nurse.' : handover.nurseText}</blockquote>
        </div>
      ) : (
        <p>Not handed over yet for this shift.</p>
      )}
      {summary ? <GiveHandoverForm key={handover?.id ?? 'new'} summary={summary} existing={handover} /> : null}
      {handover ? <ReceiveHandoverForm handover={handover} /> : null}

      {summary ? (
        <>
          <h2>Generated summary</h2>
          <HandoverSummaryText summary={summary} />
        </>
      ) : null}

      <h2>Trends, last 24 hours</h2>
      <p class="sub">Shaded: the {shift.name} shift. Dashed lines: the unit's limits. Open diamonds: flagged reads. QTc uses one formula throughout, the unit's choice.</p>
      {trend ? (
        <div class="handover-trends">
          <TrendChart series={trend.rateBpm} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={unit.timeZone} size="full" shift={shiftSpan} nowMs={nowMs} />
          <TrendChart series={trend.qtcMs} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={unit.timeZone} size="full" shift={shiftSpan} nowMs={nowMs} />
          <TrendChart series={trend.prMs} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={unit.timeZone} size="full" shift={shiftSpan} nowMs={nowMs} />
          <TrendChart series={trend.qrsMs} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={unit.timeZone} size="full" shift={shiftSpan} nowMs={nowMs} />
        </div>
      ) : null}

      <h2>Reads this shift</h2>
      {inShift.length === 0 ? (
        <p class="empty-state">No read was recorded this shift{summary?.stayStartedInShift ? ` (monitoring began at ${clockText(stay.startMs, unit.timeZone)})` : ''}.</p>
      ) : (
        <ShiftReadsTable reads={inShift} timeZone={unit.timeZone} formula={policy.defaultQtcFormula} caption={`${inShift.length} ${inShift.length === 1 ? 'read' : 'reads'}, oldest first`} />
      )}

      <h2>Print and export</h2>
      <div class="desk-actions">
        <a class="button" href={hrefOf({ screen: 'print', bedId: bed.id, shiftKey: shift.key, paper: 'a4' })}>
          Print this bed's shift summary
        </a>
        <a class="button" href={hrefOf({ screen: 'bed', bedId: bed.id })}>
          Open the bed (all reads, new read)
        </a>
      </div>
      <ExportButtons
        what="This stay, every read"
        make={(format) => stayExportFile(format, { unit, policy, stayReads: { stay, bedLabel: bed.label, reads: row.reads, amendments: row.amendments }, nowMs: Date.now() })}
        audit={{ scope: 'stay', recordId: stay.id }}
      />
    </section>
  );
}
