import type { HandoverStatus } from '../../handover-desk-rows.ts';

/** Each status in words, as the chip and the print say it. */
export const handoverStatusWords: Record<HandoverStatus, string> = {
  'not-started': 'Handover not started',
  written: 'Written, not yet received',
  acknowledged: 'Received',
};

/** Our own shapes: not started an empty ring, written a half-filled ring, received a filled ring with a tick. */
function StatusShape({ status }: { status: HandoverStatus }) {
  if (status === 'not-started') {
    return (
      <svg viewBox="0 0 20 20" width="20" height="20" aria-hidden="true" class="hs-shape">
        <circle cx="10" cy="10" r="8" fill="none" stroke="currentColor" stroke-width="2.5" stroke-dasharray="3 2.5" />
      </svg>
    );
  }
  if (status === 'written') {
    return (
      <svg viewBox="0 0 20 20" width="20" height="20" aria-hidden="true" class="hs-shape">
        <circle cx="10" cy="10" r="8" fill="none" stroke="currentColor" stroke-width="2.5" />
        <path d="M10 2 A8 8 0 0 0 10 18 Z" fill="currentColor" />
      </svg>
    );
  }
  return (
    <svg viewBox="0 0 20 20" width="20" height="20" aria-hidden="true" class="hs-shape">
      <circle cx="10" cy="10" r="9" fill="currentColor" />
      <path d="M5.5 10.5 L8.8 13.6 L14.6 6.8" fill="none" stroke="#fff" stroke-width="2.6" stroke-linecap="round" stroke-linejoin="round" />
    </svg>
  );
}

/** A bed's handover status in shape and words (never colour alone), with who received it when known. */
export function HandoverStatusChip({ status, detail }: { status: HandoverStatus; detail?: string }) {
  return (
    <span class={`hs-chip hs-${status}`}>
      <StatusShape status={status} />
      <span class="hs-word">{handoverStatusWords[status]}</span>
      {detail ? <span class="hs-detail">{detail}</span> : null}
    </span>
  );
}
