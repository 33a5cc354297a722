import { useMemo, useState } from 'preact/hooks';
import type { RhythmDb } from '../../store/db.ts';
import { browserConnection } from '../../sync/browser-sync-engine.ts';
import type { ServerConnection } from '../../sync/server-call.ts';
import type { SyncEngine } from '../../sync/sync-engine.ts';
import { ServerSignIn } from '../../sync/ui/ServerSignIn.tsx';

/**
 * Signs in to the unit server (and enrols the tablet), then syncs at once so the unit and accounts
 * arrive. Once done it offers to connect another account, so a charge nurse setting up a shift's
 * nurses stays on the same screen. `connection` defaults to the page's own origin.
 */
export function ServerConnect({ db, sync, connection: given }: { db: RhythmDb; sync: SyncEngine; connection?: ServerConnection }) {
  const connection = useMemo(() => given ?? browserConnection(), [given]);
  const [done, setDone] = useState<string | null>(null);
  if (done) {
    return (
      <div class="server-connect-done">
        <p class="flash" role="status">
          {done}
        </p>
        <button type="button" class="button" onClick={() => setDone(null)}>
          Connect another account
        </button>
      </div>
    );
  }
  return (
    <ServerSignIn
      db={db}
      connection={connection}
      onDone={(user) => {
        setDone(`Signed in as ${user.name}. This tablet now syncs with the unit server.`);
        void sync.refresh().then(() => sync.syncNow());
      }}
    />
  );
}
