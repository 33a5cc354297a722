import { fireEvent, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { BedHandover } from '../../src/app/screens/handover/BedHandover.tsx';
import type { Handover } from '../../src/core/records.ts';
import { ann, beds, bob, cara, clinicianRow, dayShiftKey, deskDb, deskNowMs, fixClock, pins, reads, renderDesk } from './handover-fixture.tsx';

const bed1 = beds[0]!;
const handoverChanges = async (db: Awaited<ReturnType<typeof deskDb>>) =>
  (await db.outbox.toArray()).filter((row) => row.kind === 'handover.put').map((row) => row.change.record as Handover);

async function giveAsAnn() {
  const db = await deskDb();
  const view = renderDesk(<BedHandover bedId={bed1.id} shiftKey={dayShiftKey} />, { db, clinician: clinicianRow(ann) });
  fireEvent.input(await screen.findByLabelText(/Your own words for the receiving nurse/), { target: { value: 'Family visiting at 20:00.' } });
  fireEvent.click(screen.getByRole('button', { name: 'Hand over as Ann Ward' }));
  await waitFor(async () => expect(await db.handovers.count()).toBe(1));
  return { db, view };
}

describe('giving and receiving a handover', () => {
  beforeEach(() => fixClock());
  afterEach(() => vi.useRealTimers());

  it('keeps the giving nurse\'s words, name and time, and queues the record for the unit server', async () => {
    const { db } = await giveAsAnn();
    const [stored] = await db.handovers.toArray();
    expect(stored).toMatchObject({ stayId: 'stay-desk-0001', shiftKey: dayShiftKey, nurseText: 'Family visiting at 20:00.', givenById: ann.id, givenByName: 'Ann Ward', givenAtMs: deskNowMs, syncStatus: 'pending' });
    // The summary covered the last read before the shift (04:00) and the three reads of the shift.
    expect(stored!.coveredRecordIds).toEqual(reads.slice(0, 4).map((r) => r.id).sort());
    const changes = await handoverChanges(db);
    expect(changes).toHaveLength(1);
    expect(changes[0]).toMatchObject({ id: stored!.id, givenByName: 'Ann Ward', nurseText: 'Family visiting at 20:00.' });
    expect(changes[0]!.receivedById).toBeUndefined();
    expect(await screen.findByText('Written, not yet received')).toBeTruthy();
  });

  it('never offers the giving nurse as the one who received it', async () => {
    await giveAsAnn();
    await screen.findByRole('group', { name: 'Receive this handover' });
    expect(screen.queryByRole('button', { name: /Received by me/ })).toBeNull();
    const receivers = within(await screen.findByRole('list', { name: 'Receiving nurse' }))
      .getAllByRole('button')
      .map((b) => b.textContent);
    expect(receivers).toEqual(['Bob Ward', 'Cara Ward']);
  });

  it('refuses a wrong PIN and keeps the handover unreceived', async () => {
    const { db } = await giveAsAnn();
    fireEvent.click(await screen.findByRole('button', { name: 'Bob Ward' }));
    fireEvent.input(screen.getByLabelText('PIN for Bob Ward'), { target: { value: '9999' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm received by Bob Ward' }));
    expect((await screen.findByRole('alert')).textContent).toBe('That PIN does not match Bob Ward.');
    expect((await db.handovers.toArray())[0]!.receivedById).toBeUndefined();
  });

  it('records the receiving nurse picked by name and PIN, with the time, as a second synced change', async () => {
    const { db } = await giveAsAnn();
    vi.setSystemTime(deskNowMs + 7 * 60_000);
    fireEvent.click(await screen.findByRole('button', { name: 'Bob Ward' }));
    fireEvent.input(screen.getByLabelText('PIN for Bob Ward'), { target: { value: pins[bob.id] } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm received by Bob Ward' }));
    await waitFor(async () => expect((await db.handovers.toArray())[0]!.receivedById).toBe(bob.id));
    const [stored] = await db.handovers.toArray();
    expect(stored).toMatchObject({ givenByName: 'Ann Ward', givenAtMs: deskNowMs, receivedByName: 'Bob Ward', receivedAtMs: deskNowMs + 7 * 60_000, syncStatus: 'pending' });
    const changes = await handoverChanges(db);
    expect(changes.map((c) => c.receivedByName ?? null)).toEqual([null, 'Bob Ward']);
    expect(await screen.findByText(/received by/)).toBeTruthy();
    expect(screen.queryByRole('group', { name: 'Receive this handover' })).toBeNull();
  });

  it('lets the nurse charting on the tablet receive it with one tap when they did not give it', async () => {
    const { db, view } = await giveAsAnn();
    view.unmount();
    renderDesk(<BedHandover bedId={bed1.id} shiftKey={dayShiftKey} />, { db, clinician: clinicianRow(cara) });
    fireEvent.click(await screen.findByRole('button', { name: 'Received by me, Cara Ward' }));
    await waitFor(async () => expect((await db.handovers.toArray())[0]!.receivedByName).toBe('Cara Ward'));
    // Only the giver may give it again; the receiver sees no give form.
    expect(screen.queryByRole('button', { name: /Hand over/ })).toBeNull();
  });

  it('lets the giver change and give it again before anyone received it, as the same record', async () => {
    const { db } = await giveAsAnn();
    const again = await screen.findByRole('button', { name: 'Hand over again as Ann Ward' });
    fireEvent.input(screen.getByLabelText(/Your handover text/), { target: { value: 'Family visiting at 20:30.' } });
    fireEvent.click(again);
    await waitFor(async () => expect((await db.handovers.toArray())[0]!.nurseText).toBe('Family visiting at 20:30.'));
    expect(await db.handovers.count()).toBe(1);
    expect((await handoverChanges(db)).map((c) => c.nurseText)).toEqual(['Family visiting at 20:00.', 'Family visiting at 20:30.']);
  });

  it('shows the summary changed since written, naming the read that came later', async () => {
    const { db } = await giveAsAnn();
    await db.reads.put({ ...reads[3]!, id: 'read-stay-desk-0001-late', stripTimeMs: deskNowMs + 60_000, enteredAtMs: deskNowMs + 60_000, signedAtMs: deskNowMs + 90_000 });
    vi.setSystemTime(deskNowMs + 120_000);
    // The live query re-renders on the new read; the summary is generated again from it.
    const warning = await screen.findByRole('alert');
    expect(warning.textContent).toContain('Changed since the handover was written');
    expect(warning.textContent).toContain('The read at 2026-03-10 18:31 is new since this summary was written.');
  });
});
