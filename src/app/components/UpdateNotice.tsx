import { useEffect, useState } from 'preact/hooks';
import type { UpdateState } from '../sw-bridge.ts';
import { applyAfterSigning, applyUpdate, onUpdateState, updateState } from '../sw-bridge.ts';

/** "An update is ready": applied only when the nurse says so and no read is being typed. */
export function UpdateNotice() {
  const [state, setState] = useState<UpdateState>(updateState());
  const [refused, setRefused] = useState(false);
  useEffect(() => onUpdateState(setState), []);
  if (state === 'none') return null;
  if (state === 'applying') return <div class="update-notice" role="status">Updating… the app will reload.</div>;
  if (state === 'after-signing') {
    return (
      <div class="update-notice" role="status">
        The update will be applied when this read is signed or left (your draft is kept).
      </div>
    );
  }
  return (
    <div class="update-notice" role="status">
      <span>An update is ready.</span>
      {refused ? (
        <>
          <span>A read is being typed, so the update waits.</span>
          <button type="button" class="button" onClick={applyAfterSigning}>
            Apply after signing
          </button>
        </>
      ) : (
        <button type="button" class="button" onClick={() => void applyUpdate().then((r) => setRefused(r === 'refused-typing'))}>
          Apply update
        </button>
      )}
    </div>
  );
}
