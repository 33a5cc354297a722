import type { RhythmDb } from './db.ts';
import type { DraftRow } from './read-draft.ts';
import { draftIdFor } from './read-draft.ts';
import { withStorageFullCheck } from './storage-full.ts';

/** Saves (or replaces) an author's draft read for a stay; a full disk throws StorageFullError and the screen keeps the typing. */
export async function saveDraft(db: RhythmDb, draft: DraftRow): Promise<void> {
  await withStorageFullCheck(() => db.drafts.put(draft));
}

/** The author's draft for a stay, if any; another nurse's draft is never returned. */
export async function loadDraft(db: RhythmDb, authorId: string, stayId: string): Promise<DraftRow | undefined> {
  const row = await db.drafts.get(draftIdFor(authorId, stayId));
  return row && row.authorId === authorId ? row : undefined;
}

/** All drafts belonging to one author. */
export async function draftsOf(db: RhythmDb, authorId: string): Promise<DraftRow[]> {
  return db.drafts.where('authorId').equals(authorId).toArray();
}

/** Throws a draft away (the nurse chose to, or it was signed). */
export async function discardDraft(db: RhythmDb, authorId: string, stayId: string): Promise<void> {
  await db.drafts.delete(draftIdFor(authorId, stayId));
}
