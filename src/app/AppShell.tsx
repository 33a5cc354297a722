import type { PersistenceState } from '../store/persistent-storage.ts';
import { useCharting } from './app-context.ts';
import { SyncStatusBar } from '../sync/ui/SyncStatusBar.tsx';
import { UpdateNotice } from './components/UpdateNotice.tsx';
import { hrefOf, useRoute } from './routes.ts';
import { AmendRead } from './screens/AmendRead.tsx';
import { BedPage } from './screens/BedPage.tsx';
import { BedsBoard } from './screens/BedsBoard.tsx';
import { NewRead } from './screens/NewRead.tsx';
import { StartMonitoring } from './screens/StartMonitoring.tsx';
import { UnitSettings } from './screens/UnitSettings.tsx';
import { useIdleLock } from './use-idle-lock.ts';

const storageWords: Record<PersistenceState, string> = {
  granted: 'Storage kept by the browser',
  'not-granted': 'Storage not guaranteed: install the app or keep it in use',
  unsupported: 'Storage not guaranteed on this browser',
};

/** Header, screen and lock for a clinician who is charting. */
export function AppShell({ onLock, storage }: { onLock: () => void; storage: PersistenceState | null }) {
  const { unit, clinician, demoWard, sync } = useCharting();
  const route = useRoute();
  useIdleLock(unit.idleLockMinutes, onLock);
  return (
    <div class="app">
      <header class="top">
        <a class="top-unit" href={hrefOf({ screen: 'board' })}>
          <span class="top-title">{unit.name}</span>
          {demoWard ? <span class="demo-tag">Demo ward: invented patients, nothing is sent</span> : null}
        </a>
        <nav class="top-nav" aria-label="Main">
          <a href={hrefOf({ screen: 'board' })} aria-current={route.screen === 'board' ? 'page' : undefined}>
            Beds
          </a>
          <a href={hrefOf({ screen: 'settings' })} aria-current={route.screen === 'settings' ? 'page' : undefined}>
            Unit settings
          </a>
        </nav>
        <div class="top-who">
          <span>
            Charting as <strong>{clinician.name}</strong>
          </span>
          <button type="button" class="button button-quiet" onClick={onLock}>
            Lock screen
          </button>
        </div>
        {storage ? <p class={`storage storage-${storage}`}>{storageWords[storage]}</p> : null}
      </header>
      {sync && !demoWard ? <SyncStatusBar engine={sync} timeZone={unit.timeZone} /> : null}
      <UpdateNotice />
      <main class="screen">
        {route.screen === 'board' ? <BedsBoard /> : null}
        {route.screen === 'bed' ? <BedPage bedId={route.bedId} /> : null}
        {route.screen === 'new-read' ? <NewRead bedId={route.bedId} /> : null}
        {route.screen === 'start-monitoring' ? <StartMonitoring bedId={route.bedId} /> : null}
        {route.screen === 'amend' ? <AmendRead readId={route.readId} /> : null}
        {route.screen === 'settings' ? <UnitSettings /> : null}
      </main>
    </div>
  );
}
