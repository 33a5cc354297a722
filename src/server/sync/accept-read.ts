import { isDeepStrictEqual } from 'node:util';
import type { SignedRead } from '../../core/records.ts';
import { changeActor, isOutcome } from './change-actor.ts';
import type { ChangeOutcome, PushContext } from './change-outcome.ts';
import { notYet, refuse } from './change-outcome.ts';
import { deriveOnReceipt, fieldInChange } from './derive-on-receipt.ts';

/**
 * A signed read: kept once, never changed. Two tablets reading the same bed make two reads
 * (different ids), both kept. The server derives the figures itself and stores them with the core version.
 */
export async function acceptRead(ctx: PushContext, read: SignedRead): Promise<ChangeOutcome> {
  const existing = await ctx.tx.getRead(read.id);
  if (existing) {
    if (isDeepStrictEqual(existing.read, read)) return { kind: 'already-stored', seq: existing.seq };
    return refuse('This read is already signed and a signed read cannot change; add an amendment instead.', [{ field: 'record.id', message: 'record.id: a different read with this id is already signed' }]);
  }
  const actor = await changeActor(ctx, read.authorId, 'record.authorId');
  if (isOutcome(actor)) return actor;
  const stay = await ctx.tx.getStay(read.stayId);
  if (!stay) {
    return notYet('The patient stay this read belongs to has not reached the server yet; the read will be sent again after it.', [
      { field: 'record.stayId', message: 'record.stayId: unknown stay on this unit' },
    ]);
  }
  const unit = await ctx.tx.getUnit();
  const derived = await deriveOnReceipt(ctx.tx, unit, stay, read);
  if (!derived.ok) {
    const errors = fieldInChange(derived.errors, (f) => `record.counts.${f}`);
    return refuse(`This read was not accepted: ${errors.map((e) => e.message).join('; ')}`, errors);
  }
  return {
    kind: 'apply',
    recordId: read.id,
    record: read,
    derived: derived.value,
    actor,
    auditKind: 'read.signed',
    auditDetail: actor.id === ctx.user.id ? null : `pushed by ${ctx.user.username}`,
    write: (seq) => ctx.tx.insertRead(read, derived.value, seq, ctx.nowMs),
  };
}
