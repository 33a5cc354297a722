import type { UserRecord } from '../storage/store.ts';
import type { ChangeOutcome, PushContext } from './change-outcome.ts';
import { notYet, refuse } from './change-outcome.ts';

/**
 * The clinician a change is made by. Usually the signed-in pusher. A shared tablet may also push
 * work that another clinician did there offline (after unlocking with their PIN): that is accepted
 * when the author is an active account of the unit who has signed in online on this very tablet.
 */
export async function changeActor(ctx: PushContext, authorId: string, field: string): Promise<UserRecord | ChangeOutcome> {
  if (authorId === ctx.user.id) return ctx.user;
  const author = await ctx.tx.getUser(authorId);
  if (!author || author.unitId !== ctx.tx.unitId || !author.active) {
    return refuse('The clinician named on this change is not an active account on this unit.', [{ field, message: `${field}: no active account on this unit has this id` }]);
  }
  if (ctx.device && (await ctx.tx.isDeviceUser(ctx.device.id, author.id))) return author;
  return notYet(`This was entered by ${author.name}, who has not signed in online on this tablet; it will be sent when they sign in here.`, [
    { field, message: `${field}: ${author.name} has not signed in online on this tablet` },
  ]);
}

export function isOutcome(value: UserRecord | ChangeOutcome): value is ChangeOutcome {
  return 'kind' in value && (value.kind === 'apply' || value.kind === 'reject' || value.kind === 'already-stored');
}
