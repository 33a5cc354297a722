import { hrefOf } from '../routes.ts';

/**
 * Why the unit server refused a read and what to do instead. A refused read is kept on the tablet
 * but cannot be amended: the server never took the read, so an amendment would wait forever.
 */
export function RefusedReadNote({ reason, bedId }: { reason: string | undefined; bedId: string }) {
  return (
    <div class="problem refused-read" role="note" aria-label="Read refused by the unit server">
      <p>
        <strong>The unit server refused this read: </strong>
        {reason ?? 'it gave no reason; ask the unit admin.'}
      </p>
      <p>
        It stays on this tablet but is not on the unit's record, so it cannot be amended. If the strip still needs charting, sign a new read; ask the unit
        admin if the reason is unclear.
      </p>
      <div class="actions">
        <a class="button button-primary" href={hrefOf({ screen: 'new-read', bedId })}>
          Sign a new read
        </a>
        <a class="button" href={hrefOf({ screen: 'refused' })}>
          Changes the unit server refused
        </a>
      </div>
    </div>
  );
}
