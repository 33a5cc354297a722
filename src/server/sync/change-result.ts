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
}
