import { ValidationError } from './field-error.ts';
import type { HandoverSummary } from './handover-summary.ts';
import { fieldErrorsFromZod } from './read-input.ts';
import type { Handover } from './records.ts';
import { handoverSchema } from './records.ts';

// A handover is given by one nurse and acknowledged by another; both names and times stay on the
// record, which syncs like any other. The record keeps the ids the summary covered, so a read or
// amendment added later shows as 'changed since written' when the summary is generated again.

/** What the giving nurse adds to a generated summary. */
export interface GiveHandoverInput {
  /** Client-made id (UUID v7) for the new record. */
  id: string;
  unitId: string;
  summary: HandoverSummary;
  nurseText: string;
  givenById: string;
  givenByName: string;
  givenAtMs: number;
}

function validated(record: Handover): Handover {
  const parsed = handoverSchema.safeParse(record);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  return parsed.data;
}

/** The handover record for a generated summary and the giving nurse's free text. */
export function giveHandover(input: GiveHandoverInput): Handover {
  if (input.givenByName.trim() === '') throw new ValidationError([{ field: 'givenByName', message: 'givenByName: the giving nurse\'s name is required' }]);
  return validated({
    id: input.id,
    unitId: input.unitId,
    stayId: input.summary.stayId,
    shiftKey: input.summary.shiftKey,
    nurseText: input.nurseText,
    givenById: input.givenById,
    givenByName: input.givenByName,
    givenAtMs: input.givenAtMs,
    coveredRecordIds: input.summary.coveredRecordIds,
  });
}

/** The record with the receiving nurse's acknowledgement; refuses a second one, the giver's own, or one before it was given. */
export function acknowledgeHandover(handover: Handover, receiver: { id: string; name: string }, atMs: number): Handover {
  if (handover.receivedById !== undefined) {
    throw new ValidationError([{ field: 'receivedById', message: `receivedById: this handover was already acknowledged by ${handover.receivedByName ?? 'another nurse'}` }]);
  }
  if (receiver.name.trim() === '') {
    throw new ValidationError([{ field: 'receivedByName', message: 'receivedByName: the receiving nurse\'s name is required' }]);
  }
  if (receiver.id === handover.givenById) {
    throw new ValidationError([{ field: 'receivedById', message: 'receivedById: the receiving nurse must be someone other than the nurse who gave the handover' }]);
  }
  if (!Number.isFinite(atMs) || atMs < handover.givenAtMs) {
    throw new ValidationError([{ field: 'receivedAtMs', min: handover.givenAtMs, message: 'receivedAtMs must be at or after the time the handover was given' }]);
  }
  return validated({ ...handover, receivedById: receiver.id, receivedByName: receiver.name, receivedAtMs: atMs });
}
