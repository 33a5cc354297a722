import type { ReadAnalysis } from '../core/analyze-read.ts';
import { ValidationError } from '../core/field-error.ts';
import { fieldErrorsFromZod } from '../core/read-input.ts';
import { deriveRead } from '../core/read-derivation.ts';
import type { Change, ReadCounts, ReadReason, SignedRead, Stay, Unit } from '../core/records.ts';
import { signedReadSchema } from '../core/records.ts';
import type { RhythmDb, StoredRead } from './db.ts';
import { previousFiguresBefore } from './derive-stay-reads.ts';
import { enqueueChange } from './outbox-entry.ts';
import { withStorageFullCheck } from './storage-full.ts';
import { unitPolicyOf } from './unit-policy-of.ts';
import { uuidV7 } from './uuid-v7.ts';

/** Who is charting: the clinician picked on the lock screen. */
export interface Author {
  id: string;
  name: string;
}

/** Everything a nurse signs for one read. */
export interface SignReadInput {
  unit: Unit;
  stay: Stay;
  stripTimeMs: number;
  counts: ReadCounts;
  reason: ReadReason;
  reasonText?: string;
  rhythmText?: string;
  ectopy?: string;
  notes?: string;
  author: Author;
  deviceId: string;
  /** When typing began. */
  enteredAtMs: number;
  nowMs: number;
  /** The draft this read came from; removed in the same transaction. */
  draftId?: string;
  /** Preset id (tests, demo); a new UUID v7 otherwise. */
  id?: string;
}

function withoutBlank<T extends object>(record: T): T {
  // Optional text left empty is left out, so the stored read says "not recorded" rather than "".
  return Object.fromEntries(Object.entries(record).filter(([, v]) => v !== undefined && v !== '')) as T;
}

/** The signed read record for the input; throws ValidationError naming each bad field. */
export function buildSignedRead(input: SignReadInput): SignedRead {
  const candidate = withoutBlank({
    id: input.id ?? uuidV7(input.nowMs),
    unitId: input.unit.id,
    bedId: input.stay.bedId,
    stayId: input.stay.id,
    stripTimeMs: input.stripTimeMs,
    enteredAtMs: input.enteredAtMs,
    signedAtMs: input.nowMs,
    authorId: input.author.id,
    authorName: input.author.name,
    deviceId: input.deviceId,
    reason: input.reason,
    reasonText: input.reasonText?.trim(),
    counts: withoutBlank(input.counts),
    rhythmText: input.rhythmText?.trim(),
    ectopy: input.ectopy?.trim(),
    notes: input.notes?.trim(),
  });
  const parsed = signedReadSchema.safeParse(candidate);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  if (input.stay.endMs !== null && input.stay.endMs <= input.stripTimeMs) {
    throw new ValidationError([{ field: 'stripTimeMs', message: 'stripTimeMs: this patient\'s monitoring ended before the strip time; check the bed and the time.' }]);
  }
  return parsed.data;
}

/**
 * Signs a read: the read, its outbox change and the removal of its draft are one transaction, so
 * the tablet never holds a read the server will not hear of, nor a draft of a read already signed.
 * Safe with two tablets offline: the read has its own UUID v7 and is never edited after signing
 * (corrections are separate amendments), so two tablets' reads of one bed both survive the merge;
 * the server applies each change id at most once, so a resend after a crash cannot duplicate it.
 */
export async function signRead(db: RhythmDb, input: SignReadInput): Promise<StoredRead> {
  const read = buildSignedRead(input);
  const policy = unitPolicyOf(input.unit);
  return withStorageFullCheck(() =>
    db.transaction('rw', [db.reads, db.amendments, db.outbox, db.drafts], async () => {
      const stayReads = await db.reads.where('stayId').equals(read.stayId).toArray();
      const stayAmendments = await db.amendments.where('stayId').equals(read.stayId).toArray();
      const previous = previousFiguresBefore(input.stay, stayReads, stayAmendments, policy, read.stripTimeMs);
      const derived = deriveRead(read, input.stay, previous, policy);
      if (!derived.ok) throw new ValidationError(derived.errors);
      const analysis: ReadAnalysis = derived.value;
      const stored: StoredRead = { ...read, analysis, syncStatus: 'pending' };
      const change: Change = { changeId: uuidV7(input.nowMs), kind: 'read.sign', deviceTimeMs: input.nowMs, record: read };
      await db.reads.add(stored);
      await enqueueChange(db, change, input.nowMs);
      if (input.draftId) await db.drafts.delete(input.draftId);
      return stored;
    }),
  );
}
