import { useMemo } from 'preact/hooks';
import type { ShiftInstance } from '../../../core/shifts.ts';
import { useCharting } from '../../app-context.ts';
import type { HandoverDeskData } from '../../handover-desk-data.ts';
import { loadHandoverDeskData } from '../../handover-desk-data.ts';
import type { DeskRow } from '../../handover-desk-rows.ts';
import { handoverDeskRows, trendWindowHours } from '../../handover-desk-rows.ts';
import { handoverShift } from '../../handover-shift.ts';
import { useLiveQuery } from '../../use-live-query.ts';
import { useNowMs } from '../../use-now.ts';

/** What the desk, a bed's handover and the printouts share: the shift, the clock, and one row per bed. */
export interface HandoverRows {
  shift: ShiftInstance;
  nowMs: number;
  data: HandoverDeskData | undefined;
  /** Undefined until the store has answered. */
  rows: DeskRow[] | undefined;
}

/** The beds of the unit for a shift (the one a route names, else the one under way), following the store live. */
export function useHandoverRows(shiftKey: string | null): HandoverRows {
  const { db, unit, policy } = useCharting();
  const nowMs = useNowMs();
  const shift = handoverShift(unit, nowMs, shiftKey);
  const sinceMs = Math.min(shift.startMs, shift.endMs - trendWindowHours * 3_600_000);
  const data = useLiveQuery(() => loadHandoverDeskData(db, unit.id, sinceMs), [db, unit.id, sinceMs]);
  // The shift is rebuilt each render; its key names it, so it is what the rows depend on.
  const rows = useMemo(() => (data ? handoverDeskRows({ unit, policy, data, shift, nowMs }) : undefined), [data, unit, policy, shift.key, nowMs]);
  return { shift, nowMs, data, rows };
}
