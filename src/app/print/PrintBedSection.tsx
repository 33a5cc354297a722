import type { ComponentChildren } from 'preact';
import type { ShiftInstance } from '../../core/shifts.ts';
import { deriveStayReads } from '../../core/stay-reads.ts';
import type { UnitPolicy } from '../../core/unit-policy.ts';
import { localDateTimeText } from '../../core/zoned-time-text.ts';
import { severityWords } from '../components/SeverityMark.tsx';
import type { DeskRow } from '../handover-desk-rows.ts';
import { bedText } from '../handover-bed-text.ts';
import { flagShortText } from '../handover-flag-text.ts';
import { shiftLengthText } from '../handover-shift.ts';
import { handoverStatusWords } from '../screens/handover/HandoverStatusChip.tsx';
import { HandoverSummaryText } from '../screens/handover/HandoverSummaryText.tsx';
import { ShiftReadsTable } from '../screens/handover/ShiftReadsTable.tsx';
import { TrendChart } from '../screens/handover/TrendChart.tsx';

/** Who printed, when, and which unit: the same on every page of one printout. */
export interface PrintContext {
  unitName: string;
  timeZone: string;
  shift: ShiftInstance;
  printedByName: string;
  printedAtMs: number;
  policy: UnitPolicy;
}

/** 'Night shift 2026-03-10 19:00 to 2026-03-11 07:00 (12 h)', with the date on both ends for paper. */
export function printShiftText(shift: ShiftInstance, timeZone: string): string {
  return `${shift.name} shift ${localDateTimeText(shift.startMs, timeZone)} to ${localDateTimeText(shift.endMs, timeZone)} (${shiftLengthText(shift.durationMs)})`;
}

/**
 * One printed frame: a table whose header row repeats on every page the frame runs onto (Chromium
 * repeats a table's thead when it breaks across pages), and whose empty footer row keeps room for
 * the caution footer fixed to the bottom of every page.
 */
export function PrintFrame({ header, children, className }: { header: ComponentChildren; children: ComponentChildren; className?: string }) {
  return (
    <table class={`print-frame${className ? ` ${className}` : ''}`}>
      <thead>
        <tr>
          <td>{header}</td>
        </tr>
      </thead>
      <tfoot>
        <tr>
          <td>
            <div class="print-footer-space" />
          </td>
        </tr>
      </tfoot>
      <tbody>
        <tr>
          <td>{children}</td>
        </tr>
      </tbody>
    </table>
  );
}

/** The page header: unit, bed, patient alias, shift, printed by and at. */
export function PrintHeader({ ctx, bedLabel, alias }: { ctx: PrintContext; bedLabel: string | null; alias: string | null }) {
  return (
    <div class="print-header">
      <p class="print-header-main">
        {bedLabel !== null ? <strong class="print-bed-label">{bedText(bedLabel)}</strong> : null}
        {alias !== null ? (
          <span>
            Patient: <strong>{alias}</strong>
          </span>
        ) : null}
        <span>
          Unit: <strong>{ctx.unitName}</strong>
        </span>
      </p>
      <p class="print-header-sub">
        <span>{printShiftText(ctx.shift, ctx.timeZone)}</span>
        <span>
          Printed by {ctx.printedByName} at {localDateTimeText(ctx.printedAtMs, ctx.timeZone)}
        </span>
      </p>
    </div>
  );
}

/** One bed's shift summary on paper: handover, trend, summary, reads with figures and units, flags with their sources. */
export function PrintBedSection({ row, ctx }: { row: DeskRow; ctx: PrintContext }) {
  const { bed, stay, summary, trend, handover } = row;
  if (!stay) return null;
  const tz = ctx.timeZone;
  const derived = deriveStayReads(row.reads, row.amendments, stay, ctx.policy).filter((d) => d.stripTimeMs >= ctx.shift.startMs && d.stripTimeMs < ctx.shift.endMs);
  const shiftSpan = { startMs: ctx.shift.startMs, endMs: ctx.shift.endMs };
  return (
    <PrintFrame className="print-bed" header={<PrintHeader ctx={ctx} bedLabel={bed.label} alias={stay.alias} />}>
      <section class="print-block" aria-label={`${bed.label}, ${stay.alias}`}>
        <p class="print-status">
          <strong>{handoverStatusWords[row.status]}.</strong>{' '}
          {handover ? `Given by ${handover.givenByName} at ${localDateTimeText(handover.givenAtMs, tz)}` : 'No handover given yet.'}
          {handover?.receivedAtMs !== undefined ? `; received by ${handover.receivedByName ?? ''} at ${localDateTimeText(handover.receivedAtMs, tz)}.` : handover ? '; not yet received.' : ''}
        </p>
        {handover && handover.nurseText !== '' ? <p class="print-nurse-text">Giving nurse's words: {handover.nurseText}</p> : null}
        {summary?.changedSinceWritten ? (
          <div class="print-changed">
            <strong>Changed since the handover was written:</strong>
            <ul>
              {summary.changesSinceWritten.map((c) => (
                <li key={c.readId}>{c.sentence}</li>
              ))}
            </ul>
          </div>
        ) : null}
        {row.summaryProblem ? <p class="print-problem">No summary could be written: {row.summaryProblem}</p> : null}
      </section>
      {trend ? (
        <section class="print-block print-trends" aria-label="Trend">
          <TrendChart series={trend.rateBpm} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={tz} size="print" shift={shiftSpan} />
          <TrendChart series={trend.qtcMs} fromMs={trend.fromMs} toMs={trend.toMs} timeZone={tz} size="print" shift={shiftSpan} />
          <p class="print-legend">Last 24 hours; shaded: this shift; dashed: the unit's limits; open diamonds: flagged reads.</p>
        </section>
      ) : null}
      {summary ? (
        <section class="print-block print-summary" aria-label="Generated summary">
          <HandoverSummaryText summary={summary} headingLevel={3} />
        </section>
      ) : null}
      <section class="print-block" aria-label="Reads this shift">
        {derived.length === 0 ? (
          <p class="print-empty">No read was recorded this shift{summary?.stayStartedInShift ? ` (monitoring began at ${localDateTimeText(stay.startMs, tz)})` : ''}.</p>
        ) : (
          <ShiftReadsTable reads={derived} timeZone={tz} formula={ctx.policy.defaultQtcFormula} caption={`Reads this shift (${derived.length})`} />
        )}
      </section>
      {summary && summary.flags.length > 0 ? (
        <section class="print-block print-flags" aria-label="Flags and their sources">
          <h3>Flags this shift and their sources</h3>
          <ul>
            {summary.flags.map((f) => (
              <li key={f.code}>
                <strong>
                  {severityWords[f.severity]}, {f.stillOpen ? 'still open' : 'no longer on the latest read'}:
                </strong>{' '}
                {flagShortText(f.latest)} on {f.figure}. Source: {f.latest.source}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </PrintFrame>
  );
}
