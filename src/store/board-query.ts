import Dexie from 'dexie';
import type { Bed } from '../core/records.ts';
import type { RhythmDb, StoredAmendment, StoredRead } from './db.ts';
import type { Stay } from '../core/records.ts';

/** What the ward board reads from the store: beds, open stays with their latest reads, and whose drafts exist. */
export interface BoardData {
  beds: Bed[];
  stays: Array<{ stay: Stay; latestReads: StoredRead[]; amendments: StoredAmendment[] }>;
  myDraftStayIds: Set<string>;
}

/** Reads for the board: each open stay's two latest reads are enough for its schedule and change flags. */
export async function loadBoardData(db: RhythmDb, unitId: string, authorId: string): Promise<BoardData> {
  const beds = await db.beds.where('unitId').equals(unitId).toArray();
  const openStays = (await db.stays.where('unitId').equals(unitId).toArray()).filter((s) => s.endMs === null);
  const stays = await Promise.all(
    openStays.map(async (stay) => {
      const latestReads = (await db.reads.where('[stayId+stripTimeMs]').between([stay.id, Dexie.minKey], [stay.id, Dexie.maxKey]).reverse().limit(2).toArray()).reverse();
      const amendments = latestReads.length === 0 ? [] : await db.amendments.where('readId').anyOf(latestReads.map((r) => r.id)).toArray();
      return { stay, latestReads, amendments };
    }),
  );
  const myDrafts = await db.drafts.where('authorId').equals(authorId).toArray();
  return { beds, stays, myDraftStayIds: new Set(myDrafts.map((d) => d.stayId)) };
}

/** Everything the bed page shows: the bed, its open stay (or the latest ended one), and that stay's reads and amendments. */
export async function loadBedData(db: RhythmDb, bedId: string) {
  const bed = await db.beds.get(bedId);
  const stays = await db.stays.where('bedId').equals(bedId).toArray();
  const stay = stays.find((s) => s.endMs === null) ?? null;
  const reads = stay ? await db.reads.where('stayId').equals(stay.id).toArray() : [];
  const amendments = stay ? await db.amendments.where('stayId').equals(stay.id).toArray() : [];
  return { bed: bed ?? null, stay, reads, amendments };
}
