import { screen, within } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { AmendRead } from '../../src/app/screens/AmendRead.tsx';
import { BedPage } from '../../src/app/screens/BedPage.tsx';
import type { SyncStatus } from '../../src/store/db.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { ManualClock, engineFor, newServer } from '../sync/sync-fixtures.ts';
import { bed, normalCounts, seededDb, stay, t0, unit } from '../store/fixtures.ts';
import { nurse, renderCharting } from './charting-fixture.tsx';

const reason = 'The clinician named on this change is not an active account on this unit.';

/** A tablet whose one read on Bed 1, by Ann, stands as the sync engine left it. */
async function tabletWithReadThat(status: SyncStatus) {
  const db = await seededDb();
  const read = await signRead(db, { unit, stay, reason: 'routine', author: { id: nurse.id, name: nurse.name }, deviceId: 't', enteredAtMs: t0, stripTimeMs: t0, counts: normalCounts, nowMs: t0 });
  if (status === 'rejected') await db.reads.update(read.id, { syncStatus: 'rejected', rejectReason: reason });
  if (status === 'accepted') await db.reads.update(read.id, { syncStatus: 'accepted' });
  return { db, read };
}

async function anEngine(db: Awaited<ReturnType<typeof seededDb>>) {
  return engineFor(db, await newServer(), new ManualClock(t0));
}

describe('a read the unit server refused', () => {
  it('shows its author why, offers a new read instead, and has no amendment form', async () => {
    const { db, read } = await tabletWithReadThat('rejected');
    await renderCharting(<AmendRead readId={read.id} />, { db });
    const note = await screen.findByRole('note', { name: 'Read refused by the unit server' });
    expect(note.textContent).toContain(`The unit server refused this read: ${reason}`);
    expect(note.textContent).toContain('cannot be amended');
    expect(within(note).getByRole('link', { name: 'Sign a new read' }).getAttribute('href')).toBe(`#/beds/${bed.id}/read`);
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Read refused by the unit server: Q.Z.');
    expect(screen.queryByLabelText('QT count', { exact: true })).toBeNull();
    expect(screen.queryByRole('button', { name: /^Save amendment/ })).toBeNull();
    // The read itself stays readable.
    expect(screen.getByRole('region', { name: 'History of this read' }).textContent).toContain('QT 10 small boxes at 25 mm/s');
  });

  it('is named as refused in the bed page\'s latest read, and its row offers no amendment', async () => {
    const { db } = await tabletWithReadThat('rejected');
    await renderCharting(<BedPage bedId={bed.id} />, { db });
    const note = await screen.findByRole('note', { name: 'Read refused by the unit server' });
    expect(note.textContent).toContain(reason);
    const row = screen.getByText(`Refused by the server: ${reason}`).closest('tr')!;
    expect(within(row).queryByRole('link', { name: 'Amend or view history' })).toBeNull();
    expect(within(row).getByRole('link', { name: 'Why refused, and history' })).toBeTruthy();
  });
});

describe('the bed page\'s latest read and the unit server', () => {
  it('says when the latest read is still waiting to send', async () => {
    const { db } = await tabletWithReadThat('pending');
    await renderCharting(<BedPage bedId={bed.id} />, { db, sync: await anEngine(db) });
    expect((await screen.findByText(/^This read is still waiting to send to the unit server\./)).textContent).toContain('It is safe on this tablet');
    expect(screen.queryByRole('note', { name: 'Read refused by the unit server' })).toBeNull();
  });

  it('says nothing about sending once the server has the read', async () => {
    const { db } = await tabletWithReadThat('accepted');
    await renderCharting(<BedPage bedId={bed.id} />, { db, sync: await anEngine(db) });
    await screen.findByText('On the unit server');
    expect(screen.queryByText(/still waiting to send/)).toBeNull();
    expect(screen.queryByRole('note', { name: 'Read refused by the unit server' })).toBeNull();
  });
});
