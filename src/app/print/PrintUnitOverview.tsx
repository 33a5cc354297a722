import { localClockText, localDateTimeText } from '../../core/zoned-time-text.ts';
import type { DeskRow } from '../handover-desk-rows.ts';
import { handoverStatusWords } from '../screens/handover/HandoverStatusChip.tsx';
import type { PrintContext } from './PrintBedSection.tsx';
import { bedText } from '../handover-bed-text.ts';
import { PrintFrame, PrintHeader } from './PrintBedSection.tsx';

function scheduleText(row: DeskRow, ctx: PrintContext): string {
  const s = row.summary?.schedule;
  if (!s) return '';
  if (s.status === 'overdue' && s.nextDueMs !== null) return `OVERDUE since ${localDateTimeText(s.nextDueMs, ctx.timeZone)}`;
  if (s.status === 'ended') return 'Monitoring ended';
  return s.nextDueMs === null ? '' : `Next due ${localClockText(s.nextDueMs, ctx.timeZone)}`;
}

function handoverText(row: DeskRow, ctx: PrintContext): string {
  const h = row.handover;
  if (!h) return handoverStatusWords['not-started'];
  const given = `given by ${h.givenByName} ${localClockText(h.givenAtMs, ctx.timeZone)}`;
  return h.receivedAtMs !== undefined ? `Received by ${h.receivedByName ?? ''} ${localClockText(h.receivedAtMs, ctx.timeZone)}; ${given}` : `Written, not yet received; ${given}`;
}

/** The unit printout's first page: every bed in the desk's order (urgent and overdue first) on one table. */
export function PrintUnitOverview({ rows, ctx }: { rows: readonly DeskRow[]; ctx: PrintContext }) {
  return (
    <PrintFrame className="print-overview" header={<PrintHeader ctx={ctx} bedLabel={null} alias={null} />}>
      <h2 class="print-bed-title">Unit overview at handover: every bed</h2>
      <table class="reads print-overview-table">
        <caption>Beds needing attention first (urgent flag open or read overdue), then the rest</caption>
        <thead>
          <tr>
            <th scope="col">Bed</th>
            <th scope="col">Patient</th>
            <th scope="col">Open flags</th>
            <th scope="col">Schedule</th>
            <th scope="col">Latest figures</th>
            <th scope="col">Handover</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => {
            const latest = row.summary?.situation.find((s) => s.startsWith('Latest figures:'))?.replace('Latest figures: ', '') ?? (row.stay ? 'No read this shift' : '');
            const o = row.openFlags;
            const flags = [o.urgent ? `${o.urgent} URGENT` : null, o.caution ? `${o.caution} Caution` : null, o.note ? `${o.note} Note` : null].filter(Boolean).join(', ');
            return (
              <tr key={row.bed.id}>
                <th scope="row">{bedText(row.bed.label)}</th>
                <td>{row.stay?.alias ?? 'No patient'}</td>
                <td>{row.stay ? flags || 'None' : ''}</td>
                <td>{scheduleText(row, ctx)}</td>
                <td>{latest}</td>
                <td>{row.stay ? `${handoverText(row, ctx)}${row.summary?.changedSinceWritten ? '; CHANGED since written' : ''}` : ''}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </PrintFrame>
  );
}
