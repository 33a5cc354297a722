import { ValidationError } from '../core/field-error.ts';
import type { HandoverSummary } from '../core/handover-summary.ts';
import { summarizeHandover } from '../core/handover-summary.ts';
import type { Amendment, Bed, SignedRead, Stay, Unit } from '../core/records.ts';
import type { ShiftInstance } from '../core/shifts.ts';
import type { StayTrend } from '../core/trend.ts';
import { trendSeries } from '../core/trend.ts';
import type { Severity, UnitPolicy } from '../core/unit-policy.ts';
import type { StoredHandover } from '../store/db.ts';
import type { HandoverDeskData } from './handover-desk-data.ts';

/** Where a bed's handover for the shift stands. */
export type HandoverStatus = 'not-started' | 'written' | 'acknowledged';

/** How the desk orders its beds. */
export type DeskOrder = 'attention' | 'bed' | 'severity' | 'due';

/** Plain words for each order, for the sort control. */
export const deskOrderNames: Record<DeskOrder, string> = {
  attention: 'Needs attention first',
  bed: 'Bed number',
  severity: 'Most severe open flags',
  due: 'Next read due',
};

/** Hours of trend each bed shows: the shift and the one before it, so a change at handover has context. */
export const trendWindowHours = 24;

/** One bed at the handover desk for one shift. */
export interface DeskRow {
  bed: Bed;
  /** The stay on the bed during the shift (the latest begun, if two overlapped), or null for an empty bed. */
  stay: Stay | null;
  reads: SignedRead[];
  amendments: Amendment[];
  summary: HandoverSummary | null;
  /** Why no summary could be written (the stored data did not pass the core's checks), in the core's words. */
  summaryProblem: string | null;
  trend: StayTrend | null;
  /** The handover given for this stay and shift (the latest given, if two tablets wrote one). */
  handover: StoredHandover | null;
  status: HandoverStatus;
  /** Flags still open on the latest read (or carried from before the shift), by severity. */
  openFlags: Record<Severity, number>;
  /** 0: urgent flag open or read overdue; 1: caution open, due soon, changed since written or a problem; 2: the rest; 3: no patient. */
  attentionRank: number;
}

/** Everything the rows are made from. */
export interface DeskRowsInput {
  unit: Unit;
  policy: UnitPolicy;
  data: HandoverDeskData;
  shift: ShiftInstance;
  nowMs: number;
}

const hourMs = 3_600_000;

/** The stay on a bed at some time during the shift: the latest begun of those overlapping it. */
export function stayDuringShift(stays: readonly Stay[], bedId: string, shift: ShiftInstance): Stay | null {
  const overlapping = stays.filter((s) => s.bedId === bedId && s.startMs < shift.endMs && (s.endMs === null || s.endMs > shift.startMs));
  return overlapping.sort((a, b) => b.startMs - a.startMs || a.id.localeCompare(b.id))[0] ?? null;
}

/** The handover given for a stay in a shift: the latest given when two tablets wrote one offline. */
export function handoverFor(handovers: readonly StoredHandover[], stayId: string, shiftKey: string): StoredHandover | null {
  const mine = handovers.filter((h) => h.stayId === stayId && h.shiftKey === shiftKey);
  return mine.sort((a, b) => b.givenAtMs - a.givenAtMs || b.id.localeCompare(a.id))[0] ?? null;
}

/** Not started, written (given, not yet received) or acknowledged. */
export function handoverStatusOf(handover: Pick<StoredHandover, 'receivedById'> | null): HandoverStatus {
  if (!handover) return 'not-started';
  return handover.receivedById === undefined ? 'written' : 'acknowledged';
}

function countOpen(summary: HandoverSummary | null): Record<Severity, number> {
  const counts: Record<Severity, number> = { urgent: 0, caution: 0, note: 0 };
  for (const f of summary?.flags ?? []) if (f.stillOpen) counts[f.severity] += 1;
  return counts;
}

function rankOf(row: Omit<DeskRow, 'attentionRank'>): number {
  if (!row.stay) return 3;
  const status = row.summary?.schedule.status;
  if (row.openFlags.urgent > 0 || status === 'overdue') return 0;
  if (row.openFlags.caution > 0 || status === 'due-soon' || row.summary?.changedSinceWritten || row.summaryProblem !== null || (row.summary?.problems.length ?? 0) > 0) return 1;
  return 2;
}

/** One row per active bed, in bed order: summary, 24 h trend, handover and status, all from the core. */
export function handoverDeskRows({ unit, policy, data, shift, nowMs }: DeskRowsInput): DeskRow[] {
  const trendToMs = shift.endMs;
  const trendFromMs = trendToMs - trendWindowHours * hourMs;
  return data.beds
    .filter((b) => b.active)
    .map((bed): DeskRow => {
      const stay = stayDuringShift(data.stays, bed.id, shift);
      if (!stay) {
        const empty = { bed, stay: null, reads: [], amendments: [], summary: null, summaryProblem: null, trend: null, handover: null, status: 'not-started' as const, openFlags: countOpen(null) };
        return { ...empty, attentionRank: rankOf(empty) };
      }
      const reads = data.reads.filter((r) => r.stayId === stay.id);
      const amendments = data.amendments.filter((a) => a.stayId === stay.id);
      const handover = handoverFor(data.handovers, stay.id, shift.key);
      let summary: HandoverSummary | null = null;
      let summaryProblem: string | null = null;
      let trend: StayTrend | null = null;
      try {
        summary = summarizeHandover(
          { unit, stay, bedLabel: bed.label, shift, reads, amendments, nowMs, ...(handover ? { writtenSummary: { coveredRecordIds: handover.coveredRecordIds } } : {}) },
          policy,
        );
        trend = trendSeries(reads, amendments, stay, policy, trendFromMs, trendToMs);
      } catch (error) {
        // A stored record the core refuses must not take the whole desk down: the bed says why.
        if (!(error instanceof ValidationError)) throw error;
        summaryProblem = error.errors.map((e) => e.message).join('; ');
      }
      const partial = { bed, stay, reads, amendments, summary, summaryProblem, trend, handover, status: handoverStatusOf(handover), openFlags: countOpen(summary) };
      return { ...partial, attentionRank: rankOf(partial) };
    });
}

const bedOrder = (a: DeskRow, b: DeskRow) => a.bed.sortOrder - b.bed.sortOrder || a.bed.label.localeCompare(b.bed.label, undefined, { numeric: true });
const bySeverity = (a: DeskRow, b: DeskRow) => b.openFlags.urgent - a.openFlags.urgent || b.openFlags.caution - a.openFlags.caution || b.openFlags.note - a.openFlags.note;
const dueMsOf = (row: DeskRow) => (row.stay ? (row.summary?.schedule.nextDueMs ?? Number.POSITIVE_INFINITY) : Number.POSITIVE_INFINITY);

/** The rows in the chosen order; every order ends in bed order, so equal beds never swap places between renders. */
export function sortDeskRows(rows: readonly DeskRow[], order: DeskOrder): DeskRow[] {
  const sorted = [...rows];
  switch (order) {
    case 'attention':
      return sorted.sort((a, b) => a.attentionRank - b.attentionRank || bySeverity(a, b) || bedOrder(a, b));
    case 'bed':
      return sorted.sort(bedOrder);
    case 'severity':
      return sorted.sort((a, b) => Number(a.stay === null) - Number(b.stay === null) || bySeverity(a, b) || bedOrder(a, b));
    case 'due':
      return sorted.sort((a, b) => dueMsOf(a) - dueMsOf(b) || bedOrder(a, b));
  }
}

/** How many beds stand where, for the desk's one-line overview. */
export interface DeskCounts {
  monitored: number;
  needAttention: number;
  notStarted: number;
  written: number;
  acknowledged: number;
  changedSinceWritten: number;
}

/** Counts over the monitored beds. */
export function deskCounts(rows: readonly DeskRow[]): DeskCounts {
  const monitored = rows.filter((r) => r.stay !== null);
  return {
    monitored: monitored.length,
    needAttention: monitored.filter((r) => r.attentionRank === 0).length,
    notStarted: monitored.filter((r) => r.status === 'not-started').length,
    written: monitored.filter((r) => r.status === 'written').length,
    acknowledged: monitored.filter((r) => r.status === 'acknowledged').length,
    changedSinceWritten: monitored.filter((r) => r.summary?.changedSinceWritten).length,
  };
}
