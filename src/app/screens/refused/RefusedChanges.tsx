import type { ChangeKind } from '../../../core/records.ts';
import type { RefusedChange } from '../../../sync/refused-changes.ts';
import { listRefusedChanges, markRefusedSeen } from '../../../sync/refused-changes.ts';
import { useCharting } from '../../app-context.ts';
import { hrefOf } from '../../routes.ts';
import { dayClockText } from '../../time-text.ts';
import { useLiveQuery } from '../../use-live-query.ts';
import './refused.css';

const kindWords: Record<ChangeKind, string> = {
  'read.sign': 'Read',
  'amendment.add': 'Amendment of a read',
  'handover.put': 'Handover',
  'stay.put': 'Patient details',
  'bed.put': 'Bed',
  'unit.put': 'Unit settings',
};

/** What to do about each kind of refusal, in one line. */
const nextStepWords: Record<ChangeKind, string> = {
  'read.sign': 'The read is kept on this tablet but is not on the unit server. If the strip still needs charting, sign a new read; ask the unit admin if the reason is unclear.',
  'amendment.add': 'The read stands as it was on the unit server. Amend it again if the change is still needed.',
  'handover.put': 'The handover is not on the unit server. Give it again, or hand over in person and tell the charge nurse.',
  'stay.put': "The unit server keeps the patient's earlier details. Check them on the bed page.",
  'bed.put': 'The unit server keeps the bed as it was. A charge nurse or unit admin can change beds.',
  'unit.put': 'The unit server keeps the earlier settings. A unit admin can change them.',
};

/** Where the nurse goes to see or redo the refused change. */
function placeLink(change: RefusedChange): { href: string; words: string } | null {
  if (change.kind === 'amendment.add' && change.readId) return { href: hrefOf({ screen: 'amend', readId: change.readId }), words: "Open the read's history" };
  if (change.bedId) return { href: hrefOf({ screen: 'bed', bedId: change.bedId }), words: `Open ${change.bedLabel ?? 'the bed'}` };
  if (change.kind === 'unit.put' || change.kind === 'bed.put') return { href: hrefOf({ screen: 'settings' }), words: 'Open unit settings' };
  return null;
}

function RefusedItem({ change, timeZone, onSeen }: { change: RefusedChange; timeZone: string; onSeen: (() => void) | null }) {
  const link = placeLink(change);
  const where = [change.bedLabel, change.alias].filter(Boolean).join(', ');
  const facts = [
    where || null,
    change.stripTimeMs !== null ? `strip time ${dayClockText(change.stripTimeMs, timeZone)}` : null,
    change.authorName ? `by ${change.authorName}` : null,
  ].filter(Boolean);
  return (
    <li class={`refused-item${change.seen ? ' refused-item--seen' : ''}`}>
      <h3 class="refused-item__title">
        {kindWords[change.kind]}
        {facts.length > 0 ? <span class="refused-item__facts"> · {facts.join(' · ')}</span> : null}
      </h3>
      <p class="refused-item__reason">
        <strong>Why refused: </strong>
        {change.reason}
      </p>
      <p class="refused-item__next">{nextStepWords[change.kind]}</p>
      <p class="refused-item__made sub">
        Made on this tablet {dayClockText(change.madeAtMs, timeZone)}
        {change.seen ? ` · marked as seen by ${change.seen.seenByName}, ${dayClockText(change.seen.seenAtMs, timeZone)}` : ''}
      </p>
      <div class="refused-item__actions">
        {link ? (
          <a class="button" href={link.href}>
            {link.words}
          </a>
        ) : null}
        {onSeen ? (
          <button type="button" class="button" onClick={onSeen}>
            Mark as seen
          </button>
        ) : null}
      </div>
    </li>
  );
}

/**
 * Every change the unit server refused, with its reason and a way to the bed or read. Marking one
 * as seen only stops the sync line counting it: the change and its record stay on this tablet.
 */
export function RefusedChanges() {
  const { db, unit, clinician } = useCharting();
  const changes = useLiveQuery(() => listRefusedChanges(db), [db]);
  if (!changes) return <p class="loading">Opening the refused changes…</p>;
  const unseen = changes.filter((c) => !c.seen);
  const seen = changes.filter((c) => c.seen);
  const markSeen = (change: RefusedChange) => () => void markRefusedSeen(db, change.changeId, { id: clinician.id, name: clinician.name }, Date.now());
  return (
    <section class="refused" aria-labelledby="refused-title">
      <h1 id="refused-title">Changes the unit server refused</h1>
      <p>The unit server did not take these changes. Each one stays on this tablet with the server's reason. Read the reason, put it right, then mark it as seen.</p>
      {changes.length === 0 ? <p>Nothing refused: every change on this tablet was taken by the unit server or is waiting to send.</p> : null}
      {changes.length > 0 ? (
        <>
          <h2>Not yet seen ({unseen.length})</h2>
          {unseen.length === 0 ? <p class="sub">None: every refused change below has been seen.</p> : null}
          <ul class="refused-list" aria-label="Refused changes not yet seen">
            {unseen.map((c) => (
              <RefusedItem key={c.changeId} change={c} timeZone={unit.timeZone} onSeen={markSeen(c)} />
            ))}
          </ul>
          {seen.length > 0 ? (
            <>
              <h2>Seen ({seen.length})</h2>
              <ul class="refused-list" aria-label="Refused changes already seen">
                {seen.map((c) => (
                  <RefusedItem key={c.changeId} change={c} timeZone={unit.timeZone} onSeen={null} />
                ))}
              </ul>
            </>
          ) : null}
        </>
      ) : null}
    </section>
  );
}
