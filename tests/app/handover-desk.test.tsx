import { fireEvent, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { HandoverDesk } from '../../src/app/screens/handover/HandoverDesk.tsx';
import { acknowledgeHandover, saveHandover } from '../../src/store/handovers.ts';
import { summarizeHandover } from '../../src/core/handover-summary.ts';
import { shiftAt } from '../../src/core/shifts.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import type { RhythmDb } from '../../src/store/db.ts';
import { ann, beds, bob, deskDb, deskNowMs, deskUnit, fakeSyncEngine, fixClock, hourMs, reads, renderDesk, stays } from './handover-fixture.tsx';

const cardTitles = async () => {
  const list = await screen.findByRole('list', { name: 'Beds at handover' });
  return within(list)
    .getAllByRole('heading', { level: 2 })
    .map((h) => h.textContent);
};

const cardOf = (bedLabel: string) => screen.getByRole('heading', { level: 2, name: new RegExp(`^${bedLabel}\\b`) }).closest('li') as HTMLElement;

async function writeHandover(db: RhythmDb, stayIndex: number, giver: { id: string; name: string }, atMs: number) {
  const stay = stays[stayIndex]!;
  const bed = beds[stayIndex]!;
  const shift = shiftAt(atMs, deskUnit.shiftPattern, deskUnit.timeZone);
  const summary = summarizeHandover({ unit: deskUnit, stay, bedLabel: bed.label, shift, reads: reads.filter((r) => r.stayId === stay.id), amendments: [], nowMs: atMs }, unitPolicyOf(deskUnit));
  return saveHandover(db, { unitId: deskUnit.id, summary, nurseText: 'Quiet shift.', giver, nowMs: atMs });
}

describe('the handover desk', () => {
  beforeEach(() => fixClock());
  afterEach(() => vi.useRealTimers());

  it('shows every bed of the unit with reads from three tablets, urgent and overdue beds first', async () => {
    renderDesk(<HandoverDesk shiftKey={null} />, { db: await deskDb() });
    // Bed 2: QTc 560 ms is at or above the urgent 500 ms limit (Drew et al. 2010). Bed 3: last read 9 h ago, 4 h interval, overdue.
    expect(await cardTitles()).toEqual(['Bed 2 M.N.', 'Bed 3 O.P.', 'Bed 1 K.L.', 'Bed 4']);
    expect(screen.getByText(/Day shift, Tue 10 Mar, 07:00 to 19:00 \(12 h\)/)).toBeTruthy();
    expect(screen.getByText(/3 beds monitored · 2 need attention first/)).toBeTruthy();
    // Authors from all three tablets appear in the beds' latest figures and flags.
    expect(within(cardOf('Bed 2')).getByLabelText('Open flags').textContent).toBe('2 URGENT');
    expect(within(cardOf('Bed 3')).getByText('OVERDUE').parentElement?.textContent).toBe('OVERDUE by 5 h 00 min');
    expect(within(cardOf('Bed 1')).getByLabelText('Open flags').textContent).toBe('No open flags');
    expect(within(cardOf('Bed 4')).getByText('No patient monitored this shift')).toBeTruthy();
  });

  it('reorders the beds by bed number, by the most severe open flags and by the next read due', async () => {
    renderDesk(<HandoverDesk shiftKey={null} />, { db: await deskDb() });
    await cardTitles();
    fireEvent.click(screen.getByRole('radio', { name: 'Bed number' }));
    expect(await cardTitles()).toEqual(['Bed 1 K.L.', 'Bed 2 M.N.', 'Bed 3 O.P.', 'Bed 4']);
    fireEvent.click(screen.getByRole('radio', { name: 'Most severe open flags' }));
    expect(await cardTitles()).toEqual(['Bed 2 M.N.', 'Bed 1 K.L.', 'Bed 3 O.P.', 'Bed 4']);
    // Next due: bed 3 at 13:30 (overdue), bed 1 at 20:00, bed 2 at 21:30.
    fireEvent.click(screen.getByRole('radio', { name: 'Next read due' }));
    expect(await cardTitles()).toEqual(['Bed 3 O.P.', 'Bed 1 K.L.', 'Bed 2 M.N.', 'Bed 4']);
    expect(screen.getByRole('radio', { name: 'Next read due' }).getAttribute('aria-checked')).toBe('true');
  });

  it('shows each bed\'s handover as not started, written or received, in words', async () => {
    const db = await deskDb();
    const given = await writeHandover(db, 0, ann, deskNowMs - 20 * 60_000);
    await acknowledgeHandover(db, { handoverId: given.id, receiver: bob, nowMs: deskNowMs - 10 * 60_000 });
    await writeHandover(db, 1, bob, deskNowMs - 5 * 60_000);
    renderDesk(<HandoverDesk shiftKey={null} />, { db });
    await cardTitles();
    await waitFor(() => expect(within(cardOf('Bed 1')).getByText('Received').parentElement?.textContent).toBe('Receivedby Bob Ward at 18:20'));
    expect(within(cardOf('Bed 2')).getByText('Written, not yet received').parentElement?.textContent).toBe('Written, not yet receivedgiven by Bob Ward at 18:25');
    expect(within(cardOf('Bed 3')).getByText('Handover not started')).toBeTruthy();
    expect(screen.getByText(/Handover: 1 not started, 1 written, 1 received/)).toBeTruthy();
  });

  it('marks a bed whose read was amended after the handover was written', async () => {
    const db = await deskDb();
    await writeHandover(db, 0, ann, deskNowMs - 30 * 60_000);
    const amended = reads[3]!;
    await db.amendments.put({
      id: 'amend-desk-0001',
      readId: amended.id,
      unitId: deskUnit.id,
      stayId: amended.stayId,
      changes: { qtSmallBoxes: 11 },
      reason: 'Recounted on lead II',
      authorId: ann.id,
      authorName: ann.name,
      deviceId: 'tablet-one',
      createdAtMs: deskNowMs - 10 * 60_000,
      syncStatus: 'accepted',
    });
    renderDesk(<HandoverDesk shiftKey={null} />, { db });
    await cardTitles();
    await waitFor(() => expect(within(cardOf('Bed 1')).getByText(/Changed since written/).parentElement?.textContent).toBe('Changed since written: 1 read new or amended'));
    expect(screen.getByText(/· 1 changed since written/)).toBeTruthy();
  });

  it('shows the previous shift when asked, with the beds as they stood then', async () => {
    renderDesk(<HandoverDesk shiftKey="2026-03-09/Night" />, { db: await deskDb() });
    expect(await screen.findByText(/Night shift, Mon 9 Mar, 19:00 to 07:00 \(12 h\)/)).toBeTruthy();
    expect(screen.getByRole('link', { name: /Previous shift/ }).getAttribute('aria-current')).toBe('page');
    // Bed 3 had one read that night (05:30, 13 h before 18:30), bed 1 one (04:00), bed 2 one (06:30).
    expect(within(cardOf('Bed 3')).queryByText('No read this shift')).toBeNull();
  });

  it('says the data is this tablet\'s only when no unit server is connected', async () => {
    renderDesk(<HandoverDesk shiftKey={null} />, { db: await deskDb() });
    expect((await screen.findByText(/not connected to a unit server/)).textContent).toBe('This tablet only — not connected to a unit server');
  });

  it('says when the data was last synced from the unit server', async () => {
    const sync = fakeSyncEngine({ lastSyncedAtMs: Date.UTC(2026, 2, 10, 18, 2) });
    renderDesk(<HandoverDesk shiftKey={null} />, { db: await deskDb(), sync });
    expect((await screen.findByText(/Data from the unit server/)).textContent).toBe('Data from the unit server, last synced 18:02');
  });

  it('warns that other tablets\' reads may be missing when the last sync failed', async () => {
    const sync = fakeSyncEngine({ lastSyncedAtMs: Date.UTC(2026, 2, 10, 16, 40), lastError: 'offline', lastErrorKind: 'unreachable' });
    renderDesk(<HandoverDesk shiftKey={null} />, { db: await deskDb(), sync });
    expect((await screen.findByText(/Data from the unit server/)).textContent).toBe('Data from the unit server, last synced 16:40 (the last try failed: newer reads from other tablets may be missing)');
  });

  it('lists a bed with no read this shift and a stay begun part-way through it', async () => {
    const db = await deskDb();
    await db.stays.put({ ...stays[0]!, id: 'stay-desk-0004', bedId: beds[3]!.id, alias: 'Q.R.', startMs: deskNowMs - 2 * hourMs, updatedAtMs: deskNowMs - 2 * hourMs });
    renderDesk(<HandoverDesk shiftKey={null} />, { db });
    await cardTitles();
    await waitFor(() => expect(within(cardOf('Bed 4')).getByText('No read this shift')).toBeTruthy());
    expect(within(cardOf('Bed 4')).getByText('Monitoring began 16:30, part-way through the shift')).toBeTruthy();
    // The baseline read fell due at the stay start and has not been taken: overdue, so it joins the first group.
    expect((await cardTitles()).slice(0, 3)).toContain('Bed 4 Q.R.');
  });
});
