import type { RhythmDb } from '../store/db.ts';
import { readSetting, writeSetting } from '../store/settings.ts';

/**
 * Makes the signed-in account's unit this tablet's unit once its record has been pulled, on a
 * tablet that has none yet (a new tablet set up by signing in rather than by the set-up screens).
 * A tablet that already has a unit, demo or real, keeps it: changing wards is the nurse's choice.
 */
export async function adoptUnit(db: RhythmDb, unitId: string): Promise<boolean> {
  return db.transaction('rw', [db.settings, db.units], async () => {
    if ((await readSetting<string | null>(db, 'currentUnitId', null)) !== null) return false;
    if (!(await db.units.get(unitId))) return false;
    await writeSetting(db, 'currentUnitId', unitId);
    return true;
  });
}
