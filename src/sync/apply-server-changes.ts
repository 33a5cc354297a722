import type { ReadAnalysis } from '../core/analyze-read.ts';
import type { Amendment, Bed, ChangeKind, Handover, SignedRead, Stay, Unit } from '../core/records.ts';
import type { OutboxRow, RhythmDb, StoredAmendment, StoredHandover, StoredRead } from '../store/db.ts';
import { deriveLocalAnalysis } from './derive-local-analysis.ts';
import type { PulledChange } from './sync-protocol.ts';
import type { ServerVersion } from './sync-settings.ts';
import { readSyncSetting, serverVersionKey, writeSyncSetting } from './sync-settings.ts';

/** Kinds whose record is replaced as a whole by each change, so the latest change of a record wins. */
export type PutKind = Extract<ChangeKind, 'unit.put' | 'bed.put' | 'stay.put' | 'handover.put'>;
const putKinds: ReadonlySet<ChangeKind> = new Set<ChangeKind>(['unit.put', 'bed.put', 'stay.put', 'handover.put']);

/** True for kinds that replace a whole record (unit, bed, stay, handover). */
export function isPutKind(kind: ChangeKind): kind is PutKind {
  return putKinds.has(kind);
}

/** What the tablet does with a pulled version of a unit, bed, stay or handover. */
export type PutDecision = 'apply' | 'already-newer' | 'hold';

/**
 * The merge rule for records edited as a whole (unit, bed, stay, handover).
 *
 * Order is the server's: a change's seq is its place in the unit's log, so the version with the
 * highest seq wins, whatever the device clocks said when each edit was made (their times stay in
 * the record as data, never as the tie-breaker). A tablet whose clock runs hours slow therefore
 * cannot push its edit behind one it never saw, nor in front of one made after it reached the server.
 *
 * A pulled version is never written over a record this tablet has an edit of still waiting to
 * send: the waiting edit is the nurse's latest word on this tablet and will be pushed, and the
 * server will place it after every version the tablet has pulled (any seq it hands out later is
 * higher), so it wins in server order anyway. Writing the older server version in the meantime
 * would make the nurse's edit vanish from the screen until the next pull. The held-back version is
 * remembered; if the server refuses the waiting edit, the row goes back to it.
 */
export function decidePulledPut(incomingSeq: number, knownSeq: number | undefined, localEditWaiting: boolean): PutDecision {
  if (knownSeq !== undefined && incomingSeq <= knownSeq) return 'already-newer';
  if (localEditWaiting) return 'hold';
  return 'apply';
}

/**
 * Where a pulled read's figures come from: the server's (the same core, on the record as the unit
 * holds it) unless this tablet holds amendments of the read, which the server's sign-time figures
 * do not include; then the tablet derives the current view itself with the core.
 */
export function analysisSourceForPulledRead(serverDerived: ReadAnalysis | null | undefined, localAmendmentCount: number): 'server' | 'tablet' {
  return serverDerived && localAmendmentCount === 0 ? 'server' : 'tablet';
}

/** The stored read for a pulled read: the unit's copy of the record, accepted, with the chosen figures. */
export function mergePulledRead(pulled: SignedRead, analysis: ReadAnalysis | null): StoredRead {
  return { ...pulled, analysis, syncStatus: 'accepted' };
}

/** What one page of pulled changes did on the tablet. */
export interface ApplySummary {
  applied: number;
  /** Versions no newer than one the tablet already holds. */
  alreadyNewer: number;
  /** Versions held back under an edit still waiting to send. */
  held: number;
  readsAdded: number;
  readsConfirmed: number;
}

/** Records that have an edit on this tablet still waiting for the server, as `${kind}:${id}`. */
export function waitingEditKeys(rows: readonly OutboxRow[]): Set<string> {
  const keys = new Set<string>();
  for (const row of rows) if (row.status === 'pending' || row.status === 'sending') keys.add(`${row.kind}:${row.change.record.id}`);
  return keys;
}

/** The tables a page of pulled changes (or a push's answers) writes; callers open one transaction over them. */
export const syncWriteTables = ['units', 'beds', 'stays', 'reads', 'amendments', 'handovers', 'outbox', 'settings'] as const;

/** Writes a record of a whole-record kind into its table; a handover written this way is the server's, so accepted. */
export async function putRecord(db: RhythmDb, kind: PutKind, record: { id: string }): Promise<void> {
  if (kind === 'unit.put') await db.units.put(record as Unit);
  else if (kind === 'bed.put') await db.beds.put(record as Bed);
  else if (kind === 'stay.put') await db.stays.put(record as Stay);
  else await db.handovers.put({ ...(record as Handover), syncStatus: 'accepted' } satisfies StoredHandover);
}

async function applyPut(db: RhythmDb, change: PulledChange & { kind: PutKind }, waiting: Set<string>, summary: ApplySummary): Promise<void> {
  const key = serverVersionKey(change.kind, change.record.id);
  const known = await readSyncSetting<ServerVersion>(db, key);
  const decision = decidePulledPut(change.seq, known?.seq, waiting.has(`${change.kind}:${change.record.id}`));
  if (decision === 'already-newer') {
    summary.alreadyNewer += 1;
    return;
  }
  await writeSyncSetting(db, key, { seq: change.seq, record: change.record } satisfies ServerVersion);
  if (decision === 'hold') {
    summary.held += 1;
    return;
  }
  await putRecord(db, change.kind, change.record);
  summary.applied += 1;
}

async function applyRead(db: RhythmDb, record: SignedRead, derived: ReadAnalysis | null | undefined, summary: ApplySummary): Promise<void> {
  // Reads are immutable and keyed by their tablet-made id, so a read this tablet signed (or pulled
  // before) is confirmed in place, never added twice.
  const existing = await db.reads.get(record.id);
  const amendmentCount = await db.amendments.where('readId').equals(record.id).count();
  const analysis = analysisSourceForPulledRead(derived, amendmentCount) === 'server' ? derived! : await deriveLocalAnalysis(db, record);
  const merged: StoredRead = { ...existing, ...mergePulledRead(record, analysis ?? existing?.analysis ?? null) };
  delete merged.rejectReason;
  await db.reads.put(merged);
  if (existing) summary.readsConfirmed += 1;
  else summary.readsAdded += 1;
  summary.applied += 1;
}

async function applyAmendment(db: RhythmDb, record: Amendment, summary: ApplySummary): Promise<void> {
  await db.amendments.put({ ...record, syncStatus: 'accepted' } satisfies StoredAmendment);
  // The read's figures are re-derived by the core from every amendment on this tablet, pending
  // ones included, so the figures always match the current view the nurse sees.
  const read = await db.reads.get(record.readId);
  if (read) {
    const analysis = await deriveLocalAnalysis(db, read);
    if (analysis) await db.reads.update(read.id, { analysis });
  }
  summary.applied += 1;
}

/**
 * Writes a page of pulled changes in server order. Call inside one transaction over
 * `syncWriteTables` (pull-changes does, together with the cursor), so a page is either wholly on
 * the tablet with its cursor, or not at all and pulled again.
 */
export async function applyServerChanges(db: RhythmDb, changes: readonly PulledChange[]): Promise<ApplySummary> {
  const summary: ApplySummary = { applied: 0, alreadyNewer: 0, held: 0, readsAdded: 0, readsConfirmed: 0 };
  const waiting = waitingEditKeys(await db.outbox.where('status').anyOf('pending', 'sending').toArray());
  const ordered = [...changes].sort((a, b) => a.seq - b.seq);
  for (const change of ordered) {
    if (change.kind === 'read.sign') await applyRead(db, change.record, change.derived, summary);
    else if (change.kind === 'amendment.add') await applyAmendment(db, change.record, summary);
    else await applyPut(db, change as PulledChange & { kind: PutKind }, waiting, summary);
  }
  return summary;
}
