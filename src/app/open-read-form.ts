/** The read form on screen, if any: what the lock and the update prompt must save or respect first. */
export interface OpenReadForm {
  /** Writes the draft now. */
  flush(): Promise<void>;
  /** True when typing has not reached the draft yet, or a read is half typed. */
  hasTyping(): boolean;
}

let current: OpenReadForm | null = null;
const listeners = new Set<() => void>();

/** Registers the read form on screen; returns the function that unregisters it. */
export function registerOpenReadForm(form: OpenReadForm): () => void {
  current = form;
  listeners.forEach((l) => l());
  return () => {
    if (current === form) current = null;
    listeners.forEach((l) => l());
  };
}

/** The read form on screen, or null. */
export function openReadForm(): OpenReadForm | null {
  return current;
}

/** Saves the draft on screen, if any (before a lock or an update). */
export async function flushOpenReadForm(): Promise<void> {
  await current?.flush();
}

/** Calls back when a read form opens or closes. */
export function onOpenReadFormChange(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}
