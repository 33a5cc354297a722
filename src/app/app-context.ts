import { createContext } from 'preact';
import { useContext } from 'preact/hooks';
import type { Unit } from '../core/records.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';
import type { ClinicianRow, RhythmDb } from '../store/db.ts';
import type { SyncEngine } from '../sync/sync-engine.ts';

/** What every screen behind the lock needs: the store, this tablet, its unit and who is charting. */
export interface Charting {
  db: RhythmDb;
  deviceId: string;
  unit: Unit;
  policy: UnitPolicy;
  clinician: ClinicianRow;
  demoWard: boolean;
  /** The sync engine with the unit server; null where none runs (tests, the demo). */
  sync: SyncEngine | null;
}

export const ChartingContext = createContext<Charting | null>(null);

/** The charting context; screens behind the lock always have one. */
export function useCharting(): Charting {
  const value = useContext(ChartingContext);
  if (!value) throw new Error('useCharting is used outside the unlocked app');
  return value;
}
