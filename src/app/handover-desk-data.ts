import type { Bed, Stay } from '../core/records.ts';
import type { RhythmDb, StoredAmendment, StoredHandover, StoredRead } from '../store/db.ts';

/** What the handover desk reads from the tablet store: every tablet's records once pulled from the unit server. */
export interface HandoverDeskData {
  beds: Bed[];
  /** Stays still open, or ended at or after `sinceMs`. */
  stays: Stay[];
  /** Every read of those stays: the schedule chain and the last read before a shift need the whole stay. */
  reads: StoredRead[];
  amendments: StoredAmendment[];
  handovers: StoredHandover[];
}

/**
 * The unit's beds and the stays that can matter for a handover from `sinceMs` on (open ones, and those
 * ended since), with all their reads, amendments and handovers. Run inside a live query, so the desk
 * follows new reads, pulled records and acknowledgements as they land.
 */
export async function loadHandoverDeskData(db: RhythmDb, unitId: string, sinceMs: number): Promise<HandoverDeskData> {
  const beds = await db.beds.where('unitId').equals(unitId).toArray();
  const stays = (await db.stays.where('unitId').equals(unitId).toArray()).filter((s) => s.endMs === null || s.endMs >= sinceMs);
  const stayIds = stays.map((s) => s.id);
  if (stayIds.length === 0) return { beds, stays, reads: [], amendments: [], handovers: [] };
  const [reads, amendments, handovers] = await Promise.all([
    db.reads.where('stayId').anyOf(stayIds).toArray(),
    db.amendments.where('stayId').anyOf(stayIds).toArray(),
    db.handovers.where('stayId').anyOf(stayIds).toArray(),
  ]);
  return { beds, stays, reads, amendments, handovers };
}
