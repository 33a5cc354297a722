import type { ReadAnalysis } from '../../core/analyze-read.ts';
import type { FieldError } from '../../core/field-error.ts';
import type { DeviceRecord, UnitTransaction, UserRecord } from '../storage/store.ts';

/** What one pushed change comes to, before anything is written. */
export type ChangeOutcome =
  | {
      kind: 'apply';
      recordId: string;
      /** The record as it goes into the unit's change log. */
      record: unknown;
      /** The server's own analysis, for reads and amendments. */
      derived: ReadAnalysis | null;
      /** Who made the change (the author), which may differ from who pushed it. */
      actor: UserRecord;
      auditKind: string;
      auditDetail: string | null;
      write(seq: number): Promise<void>;
    }
  /** The very same record is already stored (re-sent under another change id): accepted as that earlier change. */
  | { kind: 'already-stored'; seq: number }
  | { kind: 'reject'; reason: string; errors: FieldError[]; remember: boolean };

/** What every change handler may use: the unit's transaction, the pusher and the tablet, the server clock. */
export interface PushContext {
  tx: UnitTransaction;
  user: UserRecord;
  device: DeviceRecord | null;
  nowMs: number;
}

/** A refusal that will be answered the same way for ever (the change itself is wrong). */
export const refuse = (reason: string, errors: FieldError[]): ChangeOutcome => ({ kind: 'reject', reason, errors, remember: true });
/** A refusal that may pass later, so it is not remembered. */
export const notYet = (reason: string, errors: FieldError[]): ChangeOutcome => ({ kind: 'reject', reason, errors, remember: false });
