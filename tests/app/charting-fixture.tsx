import { render } from '@testing-library/preact';
import type { ComponentChildren } from 'preact';
import type { Unit } from '../../src/core/records.ts';
import { ChartingContext } from '../../src/app/app-context.ts';
import type { ClinicianRow, RhythmDb } from '../../src/store/db.ts';
import type { SyncEngine } from '../../src/sync/sync-engine.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import { seededDb, unit as testUnit } from '../store/fixtures.ts';

export const nurse: ClinicianRow = { id: 'clin-test-ann', name: 'Ann Test', role: 'nurse', pinHash: 'x', pinSalt: 'x', pinIterations: 1, active: true, createdAtMs: 0 };

/** Renders a screen behind the lock, as the clinician, on a tablet holding the test unit, bed and stay. */
export async function renderCharting(ui: ComponentChildren, options: { db?: RhythmDb; unit?: Unit; clinician?: ClinicianRow; sync?: SyncEngine } = {}) {
  const db = options.db ?? (await seededDb());
  const unit = options.unit ?? testUnit;
  const result = render(
    <ChartingContext.Provider value={{ db, deviceId: 'tablet-test', unit, policy: unitPolicyOf(unit), clinician: options.clinician ?? nurse, demoWard: false, sync: options.sync ?? null }}>{ui}</ChartingContext.Provider>,
  );
  return { db, ...result };
}
