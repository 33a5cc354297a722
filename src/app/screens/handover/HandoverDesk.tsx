import { useEffect, useState } from 'preact/hooks';
import type { StayReads } from '../../../core/stay-reads.ts';
import { useCharting } from '../../app-context.ts';
import { DecisionSupportNote } from '../../components/DecisionSupportNote.tsx';
import { dataSourceText } from '../../handover-data-source.ts';
import type { DeskOrder, DeskRow } from '../../handover-desk-rows.ts';
import { deskCounts, deskOrderNames, sortDeskRows } from '../../handover-desk-rows.ts';
import { sendQueuedExportAudits } from '../../handover-export-audit.ts';
import { shiftExportFile } from '../../handover-export.ts';
import { shiftChoices, shiftText } from '../../handover-shift.ts';
import { hrefOf } from '../../routes.ts';
import { clockText } from '../../time-text.ts';
import { DeskBedCard } from './DeskBedCard.tsx';
import { ExportButtons, auditConnectionOf } from './ExportButtons.tsx';
import { useHandoverRows } from './use-handover-rows.ts';
import { useSyncState } from './use-sync-state.ts';

const orders: DeskOrder[] = ['attention', 'bed', 'severity', 'due'];

/** The monitored stays of the rows, with their reads, for a shift export. */
export function stayReadsOf(rows: readonly DeskRow[]): StayReads[] {
  return rows.flatMap((r) => (r.stay ? [{ stay: r.stay, bedLabel: r.bed.label, reads: r.reads, amendments: r.amendments }] : []));
}

/** The charge nurse's view at shift change: every bed of the unit, flagged and overdue first, with each handover's state. */
export function HandoverDesk({ shiftKey }: { shiftKey: string | null }) {
  const charting = useCharting();
  const { db, unit, policy, sync, demoWard } = charting;
  const { shift, nowMs, rows } = useHandoverRows(shiftKey);
  const [order, setOrder] = useState<DeskOrder>('attention');
  const syncState = useSyncState(sync);
  const source = dataSourceText(syncState, demoWard, nowMs, unit.timeZone);
  const lastSyncedAtMs = syncState?.lastSyncedAtMs ?? null;

  // Export audits queued offline go once the tablet has synced again.
  useEffect(() => {
    const connection = auditConnectionOf(charting);
    if (connection && lastSyncedAtMs !== null) void sendQueuedExportAudits(db, connection).catch(() => undefined);
  }, [db, lastSyncedAtMs]);

  const choices = shiftChoices(unit, nowMs);
  const onCurrent = shift.key === choices.current.key;
  if (!rows) return <p class="loading">Gathering the unit's beds…</p>;
  const sorted = sortDeskRows(rows, order);
  const counts = deskCounts(rows);
  return (
    <section class="handover-desk" aria-labelledby="desk-title">
      <div class="screen-head">
        <h1 id="desk-title">Handover desk</h1>
        <p class="screen-sub desk-shift">{shiftText(shift, unit.timeZone)}</p>
        <p class={`data-source data-source-${source.tone}`} role="status">
          {source.text}
        </p>
      </div>
      <nav class="shift-switch" aria-label="Which shift">
        <a class="button" href={hrefOf({ screen: 'handover', shiftKey: choices.current.key })} aria-current={onCurrent ? 'page' : undefined}>
          This shift (ends {clockText(choices.current.endMs, unit.timeZone)})
        </a>
        <a class="button" href={hrefOf({ screen: 'handover', shiftKey: choices.previous.key })} aria-current={shift.key === choices.previous.key ? 'page' : undefined}>
          Previous shift ({choices.previous.name}, ended {clockText(choices.previous.endMs, unit.timeZone)})
        </a>
      </nav>
      <p class="desk-overview">
        {counts.monitored} {counts.monitored === 1 ? 'bed' : 'beds'} monitored · {counts.needAttention} {counts.needAttention === 1 ? 'needs' : 'need'} attention first (urgent flag or overdue) · Handover: {counts.notStarted} not started, {counts.written} written, {counts.acknowledged} received
        {counts.changedSinceWritten > 0 ? ` · ${counts.changedSinceWritten} changed since written` : ''}
      </p>
      <DecisionSupportNote />
      <div class="desk-tools">
        <div class="segmented" role="radiogroup" aria-label="Order beds by">
          <span class="segmented-label">Order beds by</span>
          {orders.map((o) => (
            <button key={o} type="button" role="radio" aria-checked={o === order} class={`segment${o === order ? ' on' : ''}`} onClick={() => setOrder(o)}>
              {deskOrderNames[o]}
            </button>
          ))}
        </div>
        <div class="desk-actions">
          <a class="button button-primary" href={hrefOf({ screen: 'print', bedId: null, shiftKey: shift.key, paper: 'a4' })}>
            Print unit summary
          </a>
          <ExportButtons
            what="This shift, all beds"
            make={(format) => shiftExportFile(format, { unit, policy, shift, stays: stayReadsOf(rows), nowMs: Date.now() })}
            audit={{ scope: 'shift', recordId: shift.key }}
          />
        </div>
      </div>
      {rows.length === 0 ? (
        <p class="empty-state">
          This ward has no beds yet. <a href={hrefOf({ screen: 'settings' })}>Add beds in Unit settings</a>.
        </p>
      ) : null}
      <ul class="desk-beds" aria-label="Beds at handover">
        {sorted.map((row) => (
          <DeskBedCard key={row.bed.id} row={row} timeZone={unit.timeZone} shiftKey={shift.key} nowMs={nowMs} />
        ))}
      </ul>
    </section>
  );
}
