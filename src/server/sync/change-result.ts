import type { FieldError } from '../../core/field-error.ts';

/** The server's answer to one pushed change; remembered so a repeated push answers exactly the same. */
export interface ChangeResult {
  changeId: string | null;
  status: 'accepted' | 'rejected';
  /** The change's place in the unit's order, when accepted. */
  seq?: number;
  /** Why the change was refused, in words a nurse can act on. */
  reason?: string;
  errors?: FieldError[];
  /**
   * Set on a refusal the server did not remember because it may pass later (the stay or read it
   * needs has not arrived, or its author has not signed in on this tablet): push the same change again.
   */
  retryable?: boolean;
}
