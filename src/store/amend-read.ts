import { ValidationError } from '../core/field-error.ts';
import { currentReadView, deriveRead } from '../core/read-derivation.ts';
import { fieldErrorsFromZod } from '../core/read-input.ts';
import type { AmendableFields, Amendment, Change, Stay, Unit } from '../core/records.ts';
import { amendmentSchema } from '../core/records.ts';
import type { RhythmDb, StoredAmendment } from './db.ts';
import { previousFiguresBefore } from './derive-stay-reads.ts';
import { enqueueChange } from './outbox-entry.ts';
import type { Author } from './sign-read.ts';
import { withStorageFullCheck } from './storage-full.ts';
import { unitPolicyOf } from './unit-policy-of.ts';
import { uuidV7 } from './uuid-v7.ts';

/** A signed read may be amended only by the nurse who signed it. */
export class AmendNotAllowedError extends Error {
  constructor(readonly readAuthorName: string) {
    super(`Only ${readAuthorName}, who signed this read, may amend it. Add a new read instead, or ask them to amend it.`);
    this.name = 'AmendNotAllowedError';
  }
}

/** Everything one amendment needs: which read, what changes, and why. */
export interface AmendReadInput {
  unit: Unit;
  stay: Stay;
  readId: string;
  changes: AmendableFields;
  reason: string;
  author: Author;
  deviceId: string;
  nowMs: number;
  id?: string;
}

/**
 * Amends a signed read: the amendment, its outbox change and the read's re-derived figures are one
 * transaction. The signed read itself is never rewritten; its current view is the read plus its
 * amendments in time order, and the original stays readable. Safe with two tablets offline: each
 * amendment is its own record with its own id, so two corrections of one read are both kept and
 * applied in time order on every device.
 */
export async function amendRead(db: RhythmDb, input: AmendReadInput): Promise<StoredAmendment> {
  const candidate = {
    id: input.id ?? uuidV7(input.nowMs),
    readId: input.readId,
    unitId: input.unit.id,
    stayId: input.stay.id,
    changes: input.changes,
    reason: input.reason.trim(),
    authorId: input.author.id,
    authorName: input.author.name,
    deviceId: input.deviceId,
    createdAtMs: input.nowMs,
  };
  const parsed = amendmentSchema.safeParse(candidate);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  const amendment: Amendment = parsed.data;
  if (Object.values(amendment.changes).every((v) => v === undefined)) {
    throw new ValidationError([{ field: 'changes', message: 'changes: nothing was changed; change at least one field or cancel.' }]);
  }
  const policy = unitPolicyOf(input.unit);
  return withStorageFullCheck(() =>
    db.transaction('rw', [db.reads, db.amendments, db.outbox], async () => {
      const read = await db.reads.get(input.readId);
      if (!read) throw new ValidationError([{ field: 'readId', message: 'readId: this read is not on this tablet.' }]);
      if (read.authorId !== input.author.id) throw new AmendNotAllowedError(read.authorName);
      const stayReads = await db.reads.where('stayId').equals(read.stayId).toArray();
      const stayAmendments = await db.amendments.where('stayId').equals(read.stayId).toArray();
      const view = currentReadView(read, [...stayAmendments, amendment]);
      const previous = previousFiguresBefore(input.stay, stayReads, stayAmendments, policy, view.current.stripTimeMs, read.id);
      const derived = deriveRead(view.current, input.stay, previous, policy);
      if (!derived.ok) throw new ValidationError(derived.errors);
      const stored: StoredAmendment = { ...amendment, syncStatus: 'pending' };
      const change: Change = { changeId: uuidV7(input.nowMs), kind: 'amendment.add', deviceTimeMs: input.nowMs, record: amendment };
      await db.amendments.add(stored);
      await db.reads.update(read.id, { analysis: derived.value });
      await enqueueChange(db, change, input.nowMs);
      return stored;
    }),
  );
}
