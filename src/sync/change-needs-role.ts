import type { ChangeKind } from '../core/records.ts';
import type { ServerUser } from './sync-protocol.ts';

/**
 * Why a change cannot go out under the signed-in account, or null when it can. The unit server
 * takes bed changes only from a charge nurse or unit admin and unit settings only from a unit
 * admin, judged by who pushes (these records name no author). On a shared tablet the session may
 * belong to a nurse who signed in after the admin who made the change, so such a change waits for
 * an account that may send it instead of being sent and refused for good.
 */
export function waitsForRole(kind: ChangeKind, pusherRole: ServerUser['role']): string | null {
  if (kind === 'bed.put' && pusherRole === 'nurse') {
    return 'This bed change waits for a charge nurse or unit admin to sign in to the unit server on this tablet: only they can send bed changes.';
  }
  if (kind === 'unit.put' && pusherRole !== 'unit-admin') {
    return 'This unit settings change waits for a unit admin to sign in to the unit server on this tablet: only they can send unit settings.';
  }
  return null;
}
