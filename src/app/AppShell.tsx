import type { PersistenceState } from '../store/persistent-storage.ts';
import { useCharting } from './app-context.ts';
import { SyncStatusBar } from '../sync/ui/SyncStatusBar.tsx';
import { UpdateNotice } from './components/UpdateNotice.tsx';
import { go, hrefOf, useRoute } from './routes.ts';
import { AmendRead } from './screens/AmendRead.tsx';
import { BedPage } from './screens/BedPage.tsx';
import { BedsBoard } from './screens/BedsBoard.tsx';
import { NewRead } from './screens/NewRead.tsx';
import { StartMonitoring } from './screens/StartMonitoring.tsx';
import { UnitSettings } from './screens/UnitSettings.tsx';
import { PrintView } from './print/PrintView.tsx';
import { BedHandover } from './screens/handover/BedHandover.tsx';
import { HandoverDesk } from './screens/handover/HandoverDesk.tsx';
import { AuditTrail } from './screens/audit/AuditTrail.tsx';
import { RefusedChanges } from './screens/refused/RefusedChanges.tsx';
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
  // A printout is drawn without the app's header and navigation, so none of it reaches paper.
  if (route.screen === 'print') return <PrintView bedId={route.bedId} shiftKey={route.shiftKey} paper={route.paper} />;
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
          <a
            href={hrefOf({ screen: 'handover', shiftKey: null })}
            class={clinician.role === 'nurse' ? undefined : 'nav-emphasis'}
            aria-current={route.screen === 'handover' || route.screen === 'handover-bed' ? 'page' : undefined}
          >
            Handover desk
          </a>
          <a href={hrefOf({ screen: 'settings' })} aria-current={route.screen === 'settings' ? 'page' : undefined}>
            Unit settings
          </a>
          {clinician.role === 'unit-admin' && !demoWard ? (
            <a href={hrefOf({ screen: 'audit' })} aria-current={route.screen === 'audit' ? 'page' : undefined}>
              Audit trail
            </a>
          ) : null}
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
      {sync && !demoWard ? <SyncStatusBar engine={sync} timeZone={unit.timeZone} onShowRefused={() => go({ screen: 'refused' })} /> : null}
      <UpdateNotice />
      <main class="screen">
        {route.screen === 'board' ? <BedsBoard /> : null}
        {route.screen === 'bed' ? <BedPage bedId={route.bedId} /> : null}
        {route.screen === 'new-read' ? <NewRead bedId={route.bedId} /> : null}
        {route.screen === 'start-monitoring' ? <StartMonitoring bedId={route.bedId} /> : null}
        {route.screen === 'amend' ? <AmendRead readId={route.readId} /> : null}
        {route.screen === 'settings' ? <UnitSettings /> : null}
        {route.screen === 'refused' ? <RefusedChanges /> : null}
        {route.screen === 'audit' ? <AuditTrail /> : null}
        {route.screen === 'handover' ? <HandoverDesk shiftKey={route.shiftKey} /> : null}
        {route.screen === 'handover-bed' ? <BedHandover bedId={route.bedId} shiftKey={route.shiftKey} /> : null}
      </main>
    </div>
  );
}
