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

/** The header's short words for the storage state, and the advice behind them (also in Unit settings). */
const storageWords: Record<PersistenceState, { short: string; advice: string }> = {
  granted: { short: 'Storage kept by the browser', advice: "The browser will not clear this tablet's data to free space." },
  'not-granted': { short: 'Storage not guaranteed', advice: 'Storage not guaranteed: install the app or keep it in use.' },
  unsupported: { short: 'Storage not guaranteed on this browser', advice: 'Storage not guaranteed on this browser.' },
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
        <div class="top-place">
          <a class="top-unit" href={hrefOf({ screen: 'board' })} title={unit.name}>
            {unit.name}
          </a>
          {demoWard || storage ? (
            <p class="top-notes">
              {demoWard ? <span class="demo-tag">Demo ward: invented patients, nothing is sent</span> : null}
              {/* The demo ward holds only invented patients: its tag matters more than the storage state. */}
              {storage && !demoWard ? (
                <span class={`storage storage-${storage}`} title={storageWords[storage].advice}>
                  {storageWords[storage].short}
                </span>
              ) : null}
            </p>
          ) : null}
        </div>
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
        {/* Who is charting and the way to stop: kept side by side so the lock is never far from the name. */}
        <div class="top-who" role="group" aria-label="Who is charting">
          <p class="top-who-name" title={clinician.name}>
            <span class="top-who-label">Charting as</span> <strong>{clinician.name}</strong>
          </p>
          <button type="button" class="button button-quiet" onClick={onLock}>
            Lock screen
          </button>
        </div>
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
