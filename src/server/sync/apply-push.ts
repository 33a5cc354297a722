import type { FieldError } from '../../core/field-error.ts';
import { fieldErrorsFromZod } from '../../core/read-input.ts';
import type { Change } from '../../core/records.ts';
import { changeSchema } from '../../core/records.ts';
import type { DeviceRecord, Store, UnitTransaction, UserRecord } from '../storage/store.ts';
import { acceptAmendment } from './accept-amendment.ts';
import { acceptRead } from './accept-read.ts';
import { acceptBedPut, acceptHandoverPut, acceptStayPut, acceptUnitPut } from './accept-record-put.ts';
import type { ChangeOutcome, PushContext } from './change-outcome.ts';
import { refuse } from './change-outcome.ts';
import type { ChangeResult } from './change-result.ts';

const changeKinds = changeSchema.options.map((o) => o.shape.kind.value);
const changeIdPattern = /^.{8,64}$/s;

const kindWords: Record<Change['kind'], string> = {
  'unit.put': 'This unit setting',
  'bed.put': 'This bed',
  'stay.put': 'This patient stay',
  'read.sign': 'This read',
  'amendment.add': 'This amendment',
  'handover.put': 'This handover',
};

function unitIdOf(change: Change): string {
  return change.kind === 'unit.put' ? change.record.id : change.record.unitId;
}

/** Validates one raw change with the shared schema; a refusal names every bad field. */
function parseChange(raw: unknown): { change: Change } | { errors: FieldError[] } {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return { errors: [{ field: 'change', message: 'change: each change must be a JSON object' }] };
  const kind = (raw as { kind?: unknown }).kind;
  if (typeof kind !== 'string' || !(changeKinds as string[]).includes(kind)) {
    return { errors: [{ field: 'kind', message: `kind must be one of ${changeKinds.join(', ')}` }] };
  }
  const result = changeSchema.safeParse(raw);
  return result.success ? { change: result.data } : { errors: fieldErrorsFromZod(result.error) };
}

async function outcomeOf(ctx: PushContext, change: Change): Promise<ChangeOutcome> {
  if (unitIdOf(change) !== ctx.tx.unitId) {
    const field = change.kind === 'unit.put' ? 'record.id' : 'record.unitId';
    return refuse(`${kindWords[change.kind]} belongs to another unit.`, [{ field, message: `${field}: must be the unit you are signed in to` }]);
  }
  switch (change.kind) {
    case 'unit.put':
      return acceptUnitPut(ctx, change.record);
    case 'bed.put':
      return acceptBedPut(ctx, change.record);
    case 'stay.put':
      return acceptStayPut(ctx, change.record);
    case 'read.sign':
      return acceptRead(ctx, change.record);
    case 'amendment.add':
      return acceptAmendment(ctx, change.record);
    case 'handover.put':
      return acceptHandoverPut(ctx, change.record);
  }
}

async function applyOne(ctx: PushContext, raw: unknown): Promise<ChangeResult> {
  const rawId = typeof raw === 'object' && raw !== null ? (raw as { changeId?: unknown }).changeId : undefined;
  const changeId = typeof rawId === 'string' && changeIdPattern.test(rawId) ? rawId : null;
  if (changeId !== null) {
    const earlier = await ctx.tx.answerOf(changeId);
    if (earlier) return earlier;
  }
  const parsed = parseChange(raw);
  let outcome: ChangeOutcome;
  if ('errors' in parsed) {
    const kind = (raw as { kind?: Change['kind'] } | null)?.kind;
    const what = kind !== undefined && kind in kindWords ? kindWords[kind] : 'This change';
    outcome = refuse(`${what} was not accepted: ${parsed.errors.map((e) => e.message).join('; ')}`, parsed.errors);
  } else {
    outcome = await outcomeOf(ctx, parsed.change);
  }

  let result: ChangeResult;
  if (outcome.kind === 'reject') {
    result = { changeId, status: 'rejected', reason: outcome.reason, errors: outcome.errors };
    if (!outcome.remember) result.retryable = true;
    if (changeId !== null) {
      await ctx.tx.appendAudit({
        unitId: ctx.tx.unitId,
        kind: 'change.rejected',
        userId: ctx.user.id,
        username: ctx.user.username,
        recordId: null,
        deviceId: ctx.device?.id ?? null,
        clientTimeMs: 'errors' in parsed ? null : parsed.change.deviceTimeMs,
        serverTimeMs: ctx.nowMs,
        detail: `${'errors' in parsed ? 'invalid change' : parsed.change.kind}; fields: ${[...new Set(outcome.errors.map((e) => e.field))].join(', ')}${outcome.remember ? '' : '; not yet'}`,
      });
    }
  } else if (outcome.kind === 'already-stored') {
    result = { changeId, status: 'accepted', seq: outcome.seq };
  } else {
    const change = (parsed as { change: Change }).change;
    const seq = await ctx.tx.appendChange({
      changeId: change.changeId,
      kind: change.kind,
      recordId: outcome.recordId,
      record: outcome.record,
      derived: outcome.derived,
      coreVersion: outcome.derived?.coreVersion ?? null,
      serverTimeMs: ctx.nowMs,
      deviceTimeMs: change.deviceTimeMs,
      userId: outcome.actor.id,
      deviceId: ctx.device?.id ?? null,
    });
    await outcome.write(seq);
    await ctx.tx.appendAudit({
      unitId: ctx.tx.unitId,
      kind: outcome.auditKind,
      userId: outcome.actor.id,
      username: outcome.actor.username,
      recordId: outcome.recordId,
      deviceId: ctx.device?.id ?? null,
      clientTimeMs: change.deviceTimeMs,
      serverTimeMs: ctx.nowMs,
      detail: outcome.auditDetail,
    });
    result = { changeId, status: 'accepted', seq };
  }
  const remember = changeId !== null && (outcome.kind !== 'reject' || outcome.remember);
  if (remember) await ctx.tx.rememberAnswer(changeId, result, ctx.nowMs);
  return result;
}

/**
 * Applies a batch of outbox changes in order, in one transaction holding the unit's change counter.
 * Each change is answered on its own; a change id seen before gets its first answer back, so a
 * retried or duplicated push applies nothing twice. If the process dies mid-push nothing of the
 * batch is kept, and the tablet's retry applies it whole.
 */
export async function applyPush(store: Store, pusher: { user: UserRecord; device: DeviceRecord | null }, rawChanges: readonly unknown[], nowMs: number): Promise<ChangeResult[]> {
  return store.inUnitTransaction(pusher.user.unitId, async (tx: UnitTransaction) => {
    const ctx: PushContext = { tx, user: pusher.user, device: pusher.device, nowMs };
    const results: ChangeResult[] = [];
    for (const raw of rawChanges) results.push(await applyOne(ctx, raw));
    return results;
  });
}
