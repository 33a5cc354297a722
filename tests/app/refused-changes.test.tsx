import { fireEvent, screen, waitFor, within } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { hrefOf, parseRoute } from '../../src/app/routes.ts';
import { BedPage } from '../../src/app/screens/BedPage.tsx';
import { RefusedChanges } from '../../src/app/screens/refused/RefusedChanges.tsx';
import { signRead } from '../../src/store/sign-read.ts';
import { bed, normalCounts, seededDb, stay, t0, unit } from '../store/fixtures.ts';
import { nurse, renderCharting } from './charting-fixture.tsx';

const reason = 'The clinician named on this change is not an active account on this unit.';

/** A tablet with two reads by Ann on Bed 1: the server refused the first and took the second. */
async function tabletWithRefusedRead() {
  const db = await seededDb();
  const refused = await signRead(db, { unit, stay, reason: 'routine', author: { id: nurse.id, name: nurse.name }, deviceId: 't', enteredAtMs: t0, stripTimeMs: t0, counts: normalCounts, nowMs: t0 });
  const taken = await signRead(db, { unit, stay, reason: 'routine', author: { id: nurse.id, name: nurse.name }, deviceId: 't', enteredAtMs: t0 + 60_000, stripTimeMs: t0 + 60_000, counts: normalCounts, nowMs: t0 + 60_000 });
  // The push answers as the sync engine writes them.
  await db.transaction('rw', [db.outbox, db.reads], async () => {
    await db.outbox.where('changeId').notEqual('').modify((row) => {
      const isRefused = row.change.record.id === refused.id;
      row.status = isRefused ? 'rejected' : 'accepted';
      if (isRefused) row.rejectReason = reason;
    });
    await db.reads.update(refused.id, { syncStatus: 'rejected', rejectReason: reason });
    await db.reads.update(taken.id, { syncStatus: 'accepted' });
  });
  return { db, refused, taken };
}

describe('the refused changes list', () => {
  it('shows the refused read with the server\'s reason, its bed, patient and strip time, and a link to the bed', async () => {
    const { db } = await tabletWithRefusedRead();
    await renderCharting(<RefusedChanges />, { db });
    const list = await screen.findByRole('list', { name: 'Refused changes not yet seen' });
    const items = within(list).getAllByRole('listitem');
    expect(items).toHaveLength(1);
    expect(within(items[0]!).getByRole('heading').textContent).toBe('Read · Bed 1, Q.Z. · strip time Tue 10 Mar, 08:00 · by Ann Test');
    expect(items[0]!.textContent).toContain(`Why refused: ${reason}`);
    expect(within(items[0]!).getByRole('link', { name: 'Open Bed 1' }).getAttribute('href')).toBe(`#/beds/${bed.id}`);
    expect(screen.getByRole('heading', { name: 'Not yet seen (1)' })).toBeTruthy();
    expect(screen.queryByRole('heading', { name: /^Seen/ })).toBeNull();
  });

  it('moves a change marked as seen under "Seen", naming who saw it, and keeps the read refused on the tablet', async () => {
    const { db, refused } = await tabletWithRefusedRead();
    await renderCharting(<RefusedChanges />, { db });
    fireEvent.click(await screen.findByRole('button', { name: 'Mark as seen' }));
    const seen = await screen.findByRole('list', { name: 'Refused changes already seen' });
    expect(within(seen).getByRole('listitem').textContent).toMatch(/marked as seen by Ann Test, /);
    expect(within(seen).queryByRole('button', { name: 'Mark as seen' })).toBeNull();
    expect(screen.getByRole('heading', { name: 'Not yet seen (0)' })).toBeTruthy();
    expect(await db.reads.get(refused.id)).toMatchObject({ syncStatus: 'rejected', rejectReason: reason });
    expect(await db.outbox.where('status').equals('rejected').count()).toBe(1);
  });

  it('says so when nothing was refused', async () => {
    const db = await seededDb();
    await renderCharting(<RefusedChanges />, { db });
    expect(await screen.findByText('Nothing refused: every change on this tablet was taken by the unit server or is waiting to send.')).toBeTruthy();
  });
});

describe('a refused read on the bed page', () => {
  it('is marked next to the read with the reason, while the accepted read says it is on the unit server', async () => {
    const { db } = await tabletWithRefusedRead();
    await renderCharting(<BedPage bedId={bed.id} />, { db });
    await waitFor(() => expect(screen.getAllByText(/^Refused by the server/)).toHaveLength(1));
    expect(screen.getByText(`Refused by the server: ${reason}`).closest('tr')?.querySelector('th')?.textContent).toBe('Tue 10 Mar, 08:00');
    expect(screen.getByText('On the unit server').closest('tr')?.querySelector('th')?.textContent).toBe('Tue 10 Mar, 08:01');
  });
});

describe('the routes of the refused list and the audit trail', () => {
  it('opens them at #/refused and #/audit, and writes the same hashes back', () => {
    expect(parseRoute('#/refused')).toEqual({ screen: 'refused' });
    expect(parseRoute('#/audit')).toEqual({ screen: 'audit' });
    expect(hrefOf({ screen: 'refused' })).toBe('#/refused');
    expect(hrefOf({ screen: 'audit' })).toBe('#/audit');
  });
});
