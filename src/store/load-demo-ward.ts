import type { RhythmDb, StoredRead } from './db.ts';
import { addClinician } from './clinicians.ts';
import { buildDemoWard } from './demo-ward.ts';
import { deriveStayReads } from '../core/stay-reads.ts';
import { withStorageFullCheck } from './storage-full.ts';
import { unitPolicyOf } from './unit-policy-of.ts';

/**
 * Loads the invented demo ward on a tablet that has no unit yet. Demo records are written without
 * outbox entries: made-up patients must never reach a real unit server.
 */
export async function loadDemoWard(db: RhythmDb, nowMs: number, pinIterations?: number): Promise<void> {
  const ward = buildDemoWard(nowMs);
  const policy = unitPolicyOf(ward.unit);
  const stored: StoredRead[] = [];
  for (const stay of ward.stays) {
    for (const derived of deriveStayReads(ward.reads, [], stay, policy)) {
      stored.push({ ...derived.view.read, analysis: derived.analysis, syncStatus: 'pending' });
    }
  }
  const existing = new Set((await db.clinicians.toArray()).map((c) => c.id));
  for (const c of ward.clinicians) {
    if (!existing.has(c.id)) await addClinician(db, { id: c.id, name: c.name, role: c.role, pin: c.pin, ...(pinIterations ? { iterations: pinIterations } : {}) }, nowMs);
  }
  await withStorageFullCheck(() =>
    db.transaction('rw', [db.units, db.beds, db.stays, db.reads, db.settings], async () => {
      await db.units.put(ward.unit);
      await db.beds.bulkPut(ward.beds);
      await db.stays.bulkPut(ward.stays);
      await db.reads.bulkPut(stored);
      await db.settings.put({ key: 'currentUnitId', value: ward.unit.id });
      await db.settings.put({ key: 'demoWard', value: true });
    }),
  );
}
