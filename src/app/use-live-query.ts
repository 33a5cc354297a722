import { liveQuery } from 'dexie';
import { useEffect, useState } from 'preact/hooks';

/** The result of a Dexie query, re-run whenever the tables it read change; undefined until the first answer. */
export function useLiveQuery<T>(query: () => Promise<T> | T, deps: readonly unknown[]): T | undefined {
  const [value, setValue] = useState<T | undefined>(undefined);
  useEffect(() => {
    const subscription = liveQuery(query).subscribe({
      next: (v) => setValue(() => v),
      error: (e: unknown) => console.error('A screen could not read the tablet store', e instanceof Error ? e.name : 'unknown error'),
    });
    return () => subscription.unsubscribe();
    // The caller lists what the query depends on, as with useEffect.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, deps);
  return value;
}
