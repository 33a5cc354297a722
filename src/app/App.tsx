import { useCallback, useEffect, useMemo, useState } from 'preact/hooks';
import type { ClinicianRow, RhythmDb } from '../store/db.ts';
import type { SyncEngine } from '../sync/sync-engine.ts';
import type { PersistenceState } from '../store/persistent-storage.ts';
import { requestPersistentStorage } from '../store/persistent-storage.ts';
import { deviceIdOf, readSetting, writeSetting } from '../store/settings.ts';
import { unitPolicyOf } from '../store/unit-policy-of.ts';
import { browserConnection } from '../sync/browser-sync-engine.ts';
import type { ServerConnection } from '../sync/server-call.ts';
import { currentDevice } from '../sync/server-session.ts';
import { ChartingContext } from './app-context.ts';
import { flushOpenReadForm } from './open-read-form.ts';
import { AppShell } from './AppShell.tsx';
import { FirstRun } from './screens/FirstRun.tsx';
import { LockScreen } from './screens/LockScreen.tsx';
import { useLiveQuery } from './use-live-query.ts';

/**
 * The tablet app: first run, then the lock screen, then the ward behind it. `connection` reaches
 * the unit server (the page's own origin unless given); it is used only alongside `sync`.
 */
export function App({ db, sync, connection: givenConnection }: { db: RhythmDb; sync?: SyncEngine; connection?: ServerConnection }) {
  const found = useLiveQuery(async () => {
    const unitId = await readSetting<string | null>(db, 'currentUnitId', null);
    const unit = unitId ? await db.units.get(unitId) : undefined;
    return { unit: unit ?? null, demoWard: await readSetting(db, 'demoWard', false), enrolled: (await currentDevice(db)) !== null };
  }, []);
  const connection = useMemo(() => givenConnection ?? browserConnection(), [givenConnection]);
  const [deviceId, setDeviceId] = useState<string | null>(null);
  const [clinician, setClinician] = useState<ClinicianRow | null>(null);
  const [storage, setStorage] = useState<PersistenceState | null>(null);

  useEffect(() => {
    void deviceIdOf(db, Date.now()).then(setDeviceId);
    void requestPersistentStorage().then(async (state) => {
      setStorage(state);
      await writeSetting(db, 'persistentStorage', state);
    });
  }, [db]);

  const lock = useCallback(async () => {
    // The draft is written before the screen hides it, so the next nurse's session cannot lose it.
    await flushOpenReadForm().catch(() => undefined);
    setClinician(null);
  }, []);

  if (found === undefined || deviceId === null) return <p class="loading">Opening the ward…</p>;
  if (found.unit === null) return <FirstRun db={db} {...(sync ? { sync } : {})} />;
  if (!clinician) {
    // Online sign-in is offered only where a unit server knows this tablet; the demo ward never sends.
    const server = sync && found.enrolled && !found.demoWard ? { connection, sync } : null;
    return <LockScreen db={db} unit={found.unit} demoWard={found.demoWard} onUnlock={setClinician} server={server} />;
  }
  return (
    <ChartingContext.Provider value={{ db, deviceId, unit: found.unit, policy: unitPolicyOf(found.unit), clinician, demoWard: found.demoWard, sync: sync ?? null }}>
      <AppShell onLock={lock} storage={storage} />
    </ChartingContext.Provider>
  );
}
