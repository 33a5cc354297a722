import { useState } from 'preact/hooks';
import type { RhythmDb } from '../../store/db.ts';
import { browserConnection } from '../../sync/browser-sync-engine.ts';
import type { SyncEngine } from '../../sync/sync-engine.ts';
import { ServerSignIn } from '../../sync/ui/ServerSignIn.tsx';

/** Signs in to the unit server (and enrols the tablet), then syncs at once so the unit and accounts arrive. */
export function ServerConnect({ db, sync }: { db: RhythmDb; sync: SyncEngine }) {
  const [done, setDone] = useState<string | null>(null);
  if (done) return <p class="flash" role="status">{done}</p>;
  return (
    <ServerSignIn
      db={db}
      connection={browserConnection()}
      onDone={(user) => {
        setDone(`Signed in as ${user.name}. This tablet now syncs with the unit server.`);
        void sync.refresh().then(() => sync.syncNow());
      }}
    />
  );
}
