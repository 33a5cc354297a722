import { Workbox } from 'workbox-window';
import { flushOpenReadForm, onOpenReadFormChange, openReadForm } from './open-read-form.ts';

/**
 * Page side of the service worker. A new version waits until the nurse agrees, and is never applied
 * under a half-typed read: the draft is saved first, and while a read is being typed the nurse can
 * choose to apply it after signing.
 */

/** The worker's file as the build emits it; never renamed once shipped, or old tablets would never update. */
export const serviceWorkerUrl = '/sw.js';
/** How often an open tablet asks the server for a new version (a shift can keep the app open for hours). */
const updateCheckIntervalMs = 30 * 60_000;

export type UpdateState = 'none' | 'ready' | 'after-signing' | 'applying';

let workbox: Workbox | null = null;
let state: UpdateState = 'none';
const listeners = new Set<(s: UpdateState) => void>();

function setState(next: UpdateState): void {
  state = next;
  listeners.forEach((l) => l(next));
}

/** The update state now. */
export function updateState(): UpdateState {
  return state;
}

/** Calls back when the update state changes; returns the unsubscribe function. */
export function onUpdateState(listener: (s: UpdateState) => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** Registers the service worker (production builds only) and listens for a waiting new version. */
export function startServiceWorker(): void {
  if (!('serviceWorker' in navigator) || import.meta.env.DEV) return;
  workbox = new Workbox(serviceWorkerUrl);
  workbox.addEventListener('waiting', () => {
    if (state === 'none') setState('ready');
  });
  void workbox.register().then(() => {
    setInterval(() => void workbox?.update(), updateCheckIntervalMs);
  });
}

// The read was signed (or left, its draft saved): an update the nurse deferred can go now.
onOpenReadFormChange(() => {
  if (state === 'after-signing' && openReadForm() === null) void applyUpdate();
});

/** Applies the waiting version after saving any open draft; refused while a read is being typed. */
export async function applyUpdate(): Promise<'applying' | 'refused-typing' | 'nothing-waiting'> {
  if (state === 'none' || state === 'applying' || !workbox) return 'nothing-waiting';
  if (openReadForm()?.hasTyping()) return 'refused-typing';
  await flushOpenReadForm();
  setState('applying');
  workbox.addEventListener('controlling', () => window.location.reload());
  workbox.messageSkipWaiting();
  return 'applying';
}

/** Applies the update as soon as the read on screen is signed or left. */
export function applyAfterSigning(): void {
  if (state === 'ready') setState('after-signing');
}

/** For tests: pretends a new version is waiting (or, with null, that none is), with a stand-in for the worker. */
export function simulateWaitingUpdateForTest(fake: Pick<Workbox, 'addEventListener' | 'messageSkipWaiting'> | null): void {
  workbox = fake as Workbox | null;
  setState(fake ? 'ready' : 'none');
}
