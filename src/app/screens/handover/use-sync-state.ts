import { useEffect, useState } from 'preact/hooks';
import type { SyncEngine, SyncState } from '../../../sync/sync-engine.ts';

/** The sync engine's state, kept current; null where no engine runs (demo ward, tests). */
export function useSyncState(engine: SyncEngine | null): SyncState | null {
  const [state, setState] = useState<SyncState | null>(() => engine?.getState() ?? null);
  useEffect(() => {
    if (!engine) return undefined;
    setState(engine.getState());
    return engine.subscribe(setState);
  }, [engine]);
  return state;
}
