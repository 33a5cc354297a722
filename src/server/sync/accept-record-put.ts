import { isDeepStrictEqual } from 'node:util';
import type { Bed, Handover, Stay, Unit } from '../../core/records.ts';
import { changeActor, isOutcome } from './change-actor.ts';
import type { ChangeOutcome, PushContext } from './change-outcome.ts';
import { notYet, refuse } from './change-outcome.ts';

/*
 * Units, beds, stays and handovers are edited, not signed: the latest version in server order is
 * the current one, whatever the tablets' clocks say, and every version stays in the change log.
 */

/** Unit settings and policy: unit admins only; earlier policy changes are history and cannot be rewritten. */
export async function acceptUnitPut(ctx: PushContext, unit: Unit): Promise<ChangeOutcome> {
  if (ctx.user.role !== 'unit-admin') return refuse('Only a unit admin can change unit settings or policy.', [{ field: 'record', message: 'record: only a unit admin can change unit settings' }]);
  const before = await ctx.tx.getUnit();
  const kept = before.policyOverrides.every((o, i) => isDeepStrictEqual(o, unit.policyOverrides[i]));
  if (!kept) {
    return refuse('Earlier policy changes are kept as history: add a new change instead of editing or removing one.', [
      { field: 'record.policyOverrides', message: `record.policyOverrides: must begin with the ${before.policyOverrides.length} earlier change(s), unchanged` },
    ]);
  }
  const changedKeys = (Object.keys(unit) as Array<keyof Unit>).filter((k) => k !== 'updatedAtMs' && !isDeepStrictEqual(unit[k], before[k]));
  const added = unit.policyOverrides.length - before.policyOverrides.length;
  return {
    kind: 'apply',
    recordId: unit.id,
    record: unit,
    derived: null,
    actor: ctx.user,
    auditKind: added > 0 ? 'policy.changed' : 'unit.changed',
    auditDetail: `changed ${changedKeys.join(', ') || 'nothing'}${added > 0 ? `; policy: ${unit.policyOverrides.slice(-added).map((o) => o.key).join(', ')}` : ''}`,
    write: () => ctx.tx.putUnit(unit),
  };
}

/** Beds: charge nurses and unit admins set up the unit's beds. */
export async function acceptBedPut(ctx: PushContext, bed: Bed): Promise<ChangeOutcome> {
  if (ctx.user.role === 'nurse') return refuse('Only a charge nurse or a unit admin can add or change beds.', [{ field: 'record', message: 'record: only a charge nurse or unit admin can change beds' }]);
  const before = await ctx.tx.getBed(bed.id);
  return { kind: 'apply', recordId: bed.id, record: bed, derived: null, actor: ctx.user, auditKind: 'bed.put', auditDetail: before ? 'updated' : 'added', write: (seq) => ctx.tx.putBed(bed, seq) };
}

/** A patient's stay on a bed: any clinician of the unit admits, edits or ends it. */
export async function acceptStayPut(ctx: PushContext, stay: Stay): Promise<ChangeOutcome> {
  const bed = await ctx.tx.getBed(stay.bedId);
  if (!bed) return notYet('The bed of this stay has not reached the server yet; it will be sent again after it.', [{ field: 'record.bedId', message: 'record.bedId: unknown bed on this unit' }]);
  const before = await ctx.tx.getStay(stay.id);
  return {
    kind: 'apply',
    recordId: stay.id,
    record: stay,
    derived: null,
    actor: ctx.user,
    auditKind: 'stay.put',
    auditDetail: !before ? 'admitted' : stay.endMs !== null && before.endMs === null ? 'ended' : 'updated',
    write: (seq) => ctx.tx.putStay(stay, seq),
  };
}

/** A handover summary: given by one nurse, later acknowledged by the receiving nurse. */
export async function acceptHandoverPut(ctx: PushContext, handover: Handover): Promise<ChangeOutcome> {
  const stay = await ctx.tx.getStay(handover.stayId);
  if (!stay) return notYet('The patient stay of this handover has not reached the server yet; it will be sent again after it.', [{ field: 'record.stayId', message: 'record.stayId: unknown stay on this unit' }]);
  const before = await ctx.tx.getHandover(handover.id);
  if (before && before.givenById !== handover.givenById) {
    return refuse('Who gave a handover cannot change; write a new handover instead.', [{ field: 'record.givenById', message: 'record.givenById: must stay as first given' }]);
  }
  const receiving = handover.receivedById !== undefined && handover.receivedById !== before?.receivedById;
  const actorField = receiving ? 'record.receivedById' : 'record.givenById';
  const actor = await changeActor(ctx, receiving ? (handover.receivedById as string) : handover.givenById, actorField);
  if (isOutcome(actor)) return actor;
  return {
    kind: 'apply',
    recordId: handover.id,
    record: handover,
    derived: null,
    actor,
    auditKind: receiving ? 'handover.received' : 'handover.given',
    auditDetail: actor.id === ctx.user.id ? null : `pushed by ${ctx.user.username}`,
    write: (seq) => ctx.tx.putHandover(handover, seq),
  };
}
