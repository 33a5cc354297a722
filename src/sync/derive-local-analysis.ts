import type { ReadAnalysis } from '../core/analyze-read.ts';
import { currentReadView, deriveRead } from '../core/read-derivation.ts';
import type { SignedRead } from '../core/records.ts';
import type { RhythmDb } from '../store/db.ts';
import { previousFiguresBefore } from '../store/derive-stay-reads.ts';
import { unitPolicyOf } from '../store/unit-policy-of.ts';

/**
 * A read's figures derived on this tablet by the core, from the read's current view (every
 * amendment on this tablet applied) and its stay, with the last earlier read as the comparison,
 * exactly as signing and amending do. Null when the stay or unit is not on this tablet yet, or the
 * counts do not pass the core's checks (the read screen then shows why, from the core).
 * Call inside a transaction over reads, amendments, stays and units.
 */
export async function deriveLocalAnalysis(db: RhythmDb, read: SignedRead): Promise<ReadAnalysis | null> {
  const [stay, unit] = await Promise.all([db.stays.get(read.stayId), db.units.get(read.unitId)]);
  if (!stay || !unit) return null;
  const policy = unitPolicyOf(unit);
  const stayReads = await db.reads.where('stayId').equals(read.stayId).toArray();
  const stayAmendments = await db.amendments.where('stayId').equals(read.stayId).toArray();
  const view = currentReadView(read, stayAmendments);
  const previous = previousFiguresBefore(stay, stayReads, stayAmendments, policy, view.current.stripTimeMs, read.id);
  const derived = deriveRead(view.current, stay, previous, policy);
  return derived.ok ? derived.value : null;
}
