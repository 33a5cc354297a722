import type { Unit } from '../core/records.ts';
import type { PolicyOverride, UnitPolicy } from '../core/unit-policy.ts';
import { applyPolicyOverrides, defaultPolicy } from '../core/unit-policy.ts';

/** The policy in force on a unit: the core's defaults with the unit's recorded changes applied in order. */
export function unitPolicyOf(unit: Pick<Unit, 'policyOverrides'>): UnitPolicy {
  return applyPolicyOverrides(defaultPolicy, unit.policyOverrides as PolicyOverride[]);
}
