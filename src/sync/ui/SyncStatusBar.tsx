import { useEffect, useState } from 'preact/hooks';
import type { SyncEngine, SyncState } from '../sync-engine.ts';
import { syncStatusText } from '../sync-status-text.ts';

/** Props of the sync line: the engine, the unit's time zone for the clock, and where refused changes are shown. */
export interface SyncStatusBarProps {
  engine: SyncEngine;
  timeZone: string;
  /** Opens the list of refused changes; the button shows only when there are some. */
  onShowRefused?: () => void;
  now?: () => number;
}

/**
 * The always-visible sync line: what waits to send, what the server refused, when the tablet last
 * synced. The words carry the meaning (the tone class only adds colour); the main sentence is a
 * polite live region, while the retry countdown sits outside it so it is not read out every second.
 */
export function SyncStatusBar({ engine, timeZone, onShowRefused, now = Date.now }: SyncStatusBarProps) {
  const [state, setState] = useState<SyncState>(engine.getState());
  const [nowMs, setNowMs] = useState(now());
  useEffect(() => engine.subscribe((next) => {
    setState(next);
    setNowMs(now());
  }), [engine]);
  const counting = state.nextRetryAtMs !== null && state.lastError !== null;
  useEffect(() => {
    if (!counting) return undefined;
    const tick = setInterval(() => setNowMs(now()), 1000);
    return () => clearInterval(tick);
  }, [counting]);
  const status = syncStatusText(state, nowMs, timeZone);
  return (
    <div class={`sync-status sync-status--${status.tone}`}>
      {/* One inline group, so the countdown reads on as part of the sentence. */}
      <span class="sync-status__words">
        <span role="status" aria-live="polite" class="sync-status__text">
          {status.text}
        </span>
        {status.retryText ? <span class="sync-status__retry">, {status.retryText}</span> : null}
      </span>
      {state.rejectedCount > 0 && onShowRefused ? (
        <button type="button" class="button button--small" onClick={onShowRefused}>
          Show refused
        </button>
      ) : (state.seenRejectedCount ?? 0) > 0 && onShowRefused ? (
        // Seen refusals are no longer news, but they stay one tap away.
        <button type="button" class="button button--small button-quiet" onClick={onShowRefused}>
          Refused changes ({state.seenRejectedCount} seen)
        </button>
      ) : null}
      {state.signedIn ? (
        <button type="button" class="button button--small" disabled={state.running} onClick={() => void engine.syncNow()}>
          Sync now
        </button>
      ) : null}
    </div>
  );
}
