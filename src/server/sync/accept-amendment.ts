import { isDeepStrictEqual } from 'node:util';
import { currentReadView } from '../../core/read-derivation.ts';
import type { Amendment, SignedRead } from '../../core/records.ts';
import { changeActor, isOutcome } from './change-actor.ts';
import type { ChangeOutcome, PushContext } from './change-outcome.ts';
import { notYet, refuse } from './change-outcome.ts';
import { deriveOnReceipt, fieldInChange } from './derive-on-receipt.ts';

/**
 * An amendment: a new record beside the read, never an edit in place. Only the read's author or a
 * unit admin may amend. Amendments apply in server order (a tablet clock hours off cannot reorder
 * them), and the server derives the amended read's figures itself.
 */
export async function acceptAmendment(ctx: PushContext, amendment: Amendment): Promise<ChangeOutcome> {
  const existing = await ctx.tx.getAmendment(amendment.id);
  if (existing) {
    if (isDeepStrictEqual(existing.amendment, amendment)) return { kind: 'already-stored', seq: existing.seq };
    return refuse('An amendment with this id is already recorded and cannot change; add another amendment.', [{ field: 'record.id', message: 'record.id: a different amendment with this id exists' }]);
  }
  const stored = await ctx.tx.getRead(amendment.readId);
  if (!stored) {
    return notYet('The read this amendment changes has not reached the server yet; the amendment will be sent again after it.', [
      { field: 'record.readId', message: 'record.readId: unknown read on this unit' },
    ]);
  }
  if (stored.read.stayId !== amendment.stayId) {
    return refuse('This amendment names a different patient stay from its read.', [{ field: 'record.stayId', message: 'record.stayId: must be the stay of the read being amended' }]);
  }
  const actor = await changeActor(ctx, amendment.authorId, 'record.authorId');
  if (isOutcome(actor)) return actor;
  if (actor.id !== stored.read.authorId && actor.role !== 'unit-admin') {
    return refuse('Only the author of this read or a unit admin can amend it.', [{ field: 'record.authorId', message: 'record.authorId: only the read\u2019s author or a unit admin can amend it' }]);
  }
  const stay = await ctx.tx.getStay(stored.read.stayId);
  if (!stay) return notYet('The patient stay of this read is missing on the server.', [{ field: 'record.stayId', message: 'record.stayId: unknown stay on this unit' }]);

  const earlier = await ctx.tx.amendmentsOf(stored.read.id);
  let current: SignedRead = stored.read;
  for (const a of [...earlier.map((e) => e.amendment), amendment]) current = currentReadView(current, [a]).current;
  const unit = await ctx.tx.getUnit();
  const derived = await deriveOnReceipt(ctx.tx, unit, stay, current);
  if (!derived.ok) {
    const errors = fieldInChange(derived.errors, (f) => (f in amendment.changes ? `record.changes.${f}` : `read.counts.${f}`));
    return refuse(`This amendment was not accepted: ${errors.map((e) => e.message).join('; ')}`, errors);
  }
  return {
    kind: 'apply',
    recordId: amendment.id,
    record: amendment,
    derived: derived.value,
    actor,
    auditKind: 'amendment.added',
    auditDetail: `read ${amendment.readId}; changed ${Object.keys(amendment.changes).sort().join(', ') || 'nothing'}${actor.id === ctx.user.id ? '' : `; pushed by ${ctx.user.username}`}`,
    write: (seq) => ctx.tx.insertAmendment(amendment, derived.value, seq, ctx.nowMs),
  };
}
