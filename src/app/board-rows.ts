import type { Flag } from '../core/read-flags.ts';
import { sortFlagsBySeverity } from '../core/read-flags.ts';
import type { ScheduleState } from '../core/read-schedule.ts';
import { readScheduleState } from '../core/read-schedule.ts';
import type { Amendment, Bed, SignedRead, Stay, Unit } from '../core/records.ts';
import { rhythmLabel } from '../core/rhythm-labels.ts';
import type { Severity, UnitPolicy } from '../core/unit-policy.ts';
import { deriveStayReads } from '../core/stay-reads.ts';

/** One bed on the ward board: who is on it, where the schedule stands, and the latest read's flags. */
export interface BoardRow {
  bed: Bed;
  stay: Stay | null;
  lastReadMs: number | null;
  schedule: ScheduleState | null;
  /** Flags of the latest read, most severe first. */
  flags: Flag[];
  rhythmName: string | null;
  hasMyDraft: boolean;
  /** 0: overdue or urgent; 1: due soon or caution; 2: the rest; 3: no patient. */
  attentionRank: number;
}

/** What the board needs for one open stay: its latest reads (newest last; two suffice for change flags). */
export interface StayLatest {
  stay: Stay;
  latestReads: SignedRead[];
  amendments: Amendment[];
}

const worst = (flags: readonly Flag[]): Severity | null => sortFlagsBySeverity(flags)[0]?.severity ?? null;

/** The board's rows, beds needing attention first (overdue or urgent, then due soon or caution), then by bed order. */
export function boardRows(unit: Unit, beds: readonly Bed[], stays: readonly StayLatest[], policy: UnitPolicy, myDraftStayIds: ReadonlySet<string>, nowMs: number): BoardRow[] {
  const rows = beds
    .filter((b) => b.active)
    .map((bed): BoardRow => {
      const entry = stays.find((s) => s.stay.bedId === bed.id && (s.stay.endMs === null || s.stay.endMs > nowMs));
      if (!entry) return { bed, stay: null, lastReadMs: null, schedule: null, flags: [], rhythmName: null, hasMyDraft: false, attentionRank: 3 };
      const derived = deriveStayReads(entry.latestReads, entry.amendments, entry.stay, policy);
      const latest = derived.at(-1);
      const flags = latest?.analysis?.flags ?? [];
      const schedule = readScheduleState({
        stayStartMs: entry.stay.startMs,
        stayEndMs: entry.stay.endMs,
        readTimesMs: derived.map((d) => d.view.current.stripTimeMs),
        intervalHours: unit.readIntervalHours,
        nowMs,
      });
      const severity = worst(flags);
      const attentionRank = schedule.status === 'overdue' || severity === 'urgent' ? 0 : schedule.status === 'due-soon' || severity === 'caution' ? 1 : 2;
      const label = latest?.view.current.counts.rhythmLabel;
      return {
        bed,
        stay: entry.stay,
        lastReadMs: schedule.lastReadMs,
        schedule,
        flags,
        rhythmName: label ? rhythmLabel(label).name : (latest?.view.current.rhythmText ?? null),
        hasMyDraft: myDraftStayIds.has(entry.stay.id),
        attentionRank,
      };
    });
  return rows.sort((a, b) => a.attentionRank - b.attentionRank || a.bed.sortOrder - b.bed.sortOrder || a.bed.label.localeCompare(b.bed.label));
}

/** How many flags of each severity a row carries, for the board's counts in words. */
export function flagCounts(flags: readonly Flag[]): Record<Severity, number> {
  const counts: Record<Severity, number> = { urgent: 0, caution: 0, note: 0 };
  for (const f of flags) counts[f.severity] += 1;
  return counts;
}
