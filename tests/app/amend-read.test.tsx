import { fireEvent, screen, waitFor } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { AmendRead } from '../../src/app/screens/AmendRead.tsx';
import { signRead } from '../../src/store/sign-read.ts';
import { normalCounts, seededDb, stay, t0, unit } from '../store/fixtures.ts';
import { nurse, renderCharting } from './charting-fixture.tsx';

async function signedByAnn() {
  const db = await seededDb();
  const read = await signRead(db, { unit, stay, reason: 'routine', author: { id: nurse.id, name: nurse.name }, deviceId: 't', enteredAtMs: t0, stripTimeMs: t0, counts: normalCounts, nowMs: t0 });
  return { db, read };
}

describe('amending a signed read', () => {
  it('shows the read as signed, recomputes as fields change, and saves the amendment with its reason', async () => {
    const { db, read } = await signedByAnn();
    await renderCharting(<AmendRead readId={read.id} />, { db });
    expect((await screen.findByRole('region', { name: 'History of this read' })).textContent).toContain('QT 10 small boxes at 25 mm/s');
    fireEvent.input(await screen.findByLabelText('QT count', { exact: true }), { target: { value: '11' } });
    // 11 boxes x 40 ms = 440 ms (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology).
    expect(screen.getByTestId('figure-qt').textContent).toBe('440 ms');
    fireEvent.input(screen.getByLabelText(/Why is the read amended/), { target: { value: 'Recounted on lead II' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save amendment as Ann Test' }));
    await waitFor(async () => expect(await db.amendments.count()).toBe(1));
    const [amendment] = await db.amendments.toArray();
    expect(amendment).toMatchObject({ reason: 'Recounted on lead II', changes: { qtSmallBoxes: 11 }, authorName: 'Ann Test' });
    expect((await db.reads.get(read.id))?.counts.qtSmallBoxes).toBe(10);
  });

  it('refuses to save without a reason, naming it', async () => {
    const { db, read } = await signedByAnn();
    await renderCharting(<AmendRead readId={read.id} />, { db });
    fireEvent.input(await screen.findByLabelText('QT count', { exact: true }), { target: { value: '11' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save amendment as Ann Test' }));
    expect((await screen.findByRole('alert')).textContent).toMatch(/say why the read is amended/);
    expect(await db.amendments.count()).toBe(0);
  });

  it('shows another nurse the history only, with who may amend', async () => {
    const { db, read } = await signedByAnn();
    await renderCharting(<AmendRead readId={read.id} />, { db, clinician: { ...nurse, id: 'clin-test-bob', name: 'Bob Test' } });
    expect(await screen.findByText(/Only Ann Test, who signed this read, may amend it/)).toBeTruthy();
    expect(screen.queryByLabelText('QT count', { exact: true })).toBeNull();
  });
});
