import { fireEvent, screen, waitFor } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { NewRead } from '../../src/app/screens/NewRead.tsx';
import { loadDraft } from '../../src/store/drafts.ts';
import { bed, stay } from '../store/fixtures.ts';
import { nurse, renderCharting } from './charting-fixture.tsx';

const type = (label: string, text: string) => fireEvent.input(screen.getByLabelText(label, { exact: true }), { target: { value: text } });

async function openForm() {
  const rendered = await renderCharting(<NewRead bedId={bed.id} />);
  await screen.findByRole('heading', { name: /New read: Bed 1, Q.Z./ });
  return rendered;
}

describe('the new read form', () => {
  beforeEach(() => {
    // Strip time defaults to now; the fixture stay began 10 h before 2026-03-10 08:00 UTC.
    vi.useFakeTimers({ now: Date.UTC(2026, 2, 10, 8, 0), toFake: ['Date'] });
  });
  afterEach(() => vi.useRealTimers());

  it('shows rate and intervals as counts are typed, from the core', async () => {
    await openForm();
    type('R-R count 1', '20');
    // 20 small boxes at 25 mm/s = 800 ms = 75 bpm: the 1500 rule (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology).
    expect(await screen.findByTestId('figure-rate')).toHaveProperty('textContent', '75 bpm');
    type('PR count', '4');
    type('QT count', '10');
    // 4 and 10 small boxes at 40 ms each (Hall & Hall 2021).
    expect(screen.getByTestId('figure-pr').textContent).toBe('160 ms');
    expect(screen.getByTestId('figure-qt').textContent).toBe('400 ms');
    // Fridericia 1920 (Die Systolendauer im Elektrokardiogramm): 400 / 0.8^(1/3) = 430.9, shown as 431 ms.
    expect(screen.getByTestId('figure-qtc').textContent).toBe('431 ms');
  });

  it('accepts half boxes typed with a comma or stepped with the buttons', async () => {
    await openForm();
    type('R-R count 1', '20');
    type('QT count', '10,5');
    // 10.5 boxes x 40 ms = 420 ms (Hall & Hall 2021).
    expect(screen.getByTestId('figure-qt').textContent).toBe('420 ms');
    fireEvent.click(screen.getByRole('button', { name: 'QT count: 0.5 more' }));
    expect((screen.getByLabelText('QT count', { exact: true }) as HTMLInputElement).value).toBe('11');
    expect(screen.getByTestId('figure-qt').textContent).toBe('440 ms');
  });

  it('recomputes at 50 mm/s when the paper speed is changed', async () => {
    await openForm();
    type('R-R count 1', '40');
    fireEvent.click(screen.getByRole('radio', { name: /50 mm\/s/ }));
    // 40 small boxes at 50 mm/s = 800 ms = 75 bpm: the 3000 rule at fast paper (clinical reference 2.4, teaching text).
    expect(screen.getByTestId('figure-rate').textContent).toBe('75 bpm');
  });

  it('shows a flag banner with its sentence, value against limit, and source', async () => {
    await openForm();
    type('R-R count 1', '20');
    type('QT count', '13');
    // QT 520 ms at R-R 800 ms: Fridericia 560 ms, at or above 500 ms (Drew et al. 2010, Prevention of torsade de pointes in hospital settings).
    const banners = await screen.findAllByRole('group', { name: /URGENT: QTc/ });
    // The baseline of 430 ms also gives a rise-from-baseline banner; the high-risk one comes first.
    expect(banners).toHaveLength(2);
    const banner = banners[0]!;
    expect(banner.textContent).toContain('is at or above the limit of 500 ms');
    expect(banner.textContent).toContain('limit: at or above 500 ms');
    expect(banner.textContent).toContain('Source: QTc of 500 ms or more');
    expect(banner.textContent).toMatch(/QTc \(Fridericia\): 560 ms/);
  });

  it('names the field and its allowed range when a count is out of range', async () => {
    await openForm();
    type('R-R count 1', '20');
    type('PR count', '30');
    const message = await screen.findByText(/^PR count: must be between/);
    expect(message.textContent).toBe('PR count: must be between 1 and 15 small boxes at 25 mm/s (40-600 ms); got 30');
    expect(screen.getByLabelText('PR count', { exact: true }).getAttribute('aria-invalid')).toBe('true');
  });

  it('names the field when the typed text is not a number', async () => {
    await openForm();
    type('QT count', '1o');
    expect(await screen.findByText('QT count: "1o" is not a number; type small boxes, e.g. 4 or 4.5.')).toBeTruthy();
  });

  it('asks the rhythm cross-check question from the core', async () => {
    await openForm();
    type('R-R count 1', '30');
    fireEvent.change(screen.getByLabelText('Rhythm on the strip'), { target: { value: 'sinus-rhythm' } });
    // 30 boxes = 1200 ms = 50 bpm, below the unit's 60 bpm (Spodick et al. 1992, Operational definition of normal sinus heart rate).
    expect(await screen.findByText(/Rate 50 bpm with 'Sinus rhythm': is this sinus bradycardia\?/)).toBeTruthy();
  });

  it('refuses to sign without any R-R or six-second count and lists why', async () => {
    const { db } = await openForm();
    fireEvent.click(screen.getByRole('button', { name: 'Sign read as Ann Test' }));
    const list = await screen.findByRole('alert', { name: 'Fix before signing' });
    expect(list.textContent).toContain('R-R count: enter at least one R-R count in small boxes, or a Six-second QRS count');
    expect(await db.reads.count()).toBe(0);
  });

  it('autosaves the typing as this nurse’s draft', async () => {
    const { db } = await openForm();
    type('QT count', '9.5');
    await waitFor(async () => expect((await loadDraft(db, nurse.id, stay.id))?.form.qtSmallBoxes).toBe('9.5'), { timeout: 2000 });
  });

  it('signs the read: stored with its outbox change and the draft gone', async () => {
    const { db } = await openForm();
    type('R-R count 1', '20');
    type('QT count', '10');
    fireEvent.click(screen.getByRole('radio', { name: 'Alarm' }));
    fireEvent.click(screen.getByRole('button', { name: 'Sign read as Ann Test' }));
    await waitFor(async () => expect(await db.reads.count()).toBe(1));
    const [read] = await db.reads.toArray();
    expect(read).toMatchObject({ reason: 'alarm', authorName: 'Ann Test', counts: { rrSmallBoxes: [20], qtSmallBoxes: 10 } });
    expect(await db.outbox.count()).toBe(1);
    await waitFor(async () => expect(await db.drafts.count()).toBe(0));
    expect(location.hash).toBe(`#/beds/${bed.id}`);
  });
});
