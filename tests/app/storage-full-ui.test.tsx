import { fireEvent, screen } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { NewRead } from '../../src/app/screens/NewRead.tsx';
import { bed, seededDb } from '../store/fixtures.ts';
import { fillDisk } from '../store/full-disk.ts';
import { renderCharting } from './charting-fixture.tsx';

describe('a full disk while charting', () => {
  beforeEach(() => vi.useFakeTimers({ now: Date.UTC(2026, 2, 10, 8, 0), toFake: ['Date'] }));
  afterEach(() => vi.useRealTimers());

  it('says the read was NOT saved, keeps every typed value on screen, and stores nothing', async () => {
    const db = await seededDb();
    await fillDisk(db, ['reads', 'outbox', 'drafts'], true);
    await renderCharting(<NewRead bedId={bed.id} />, { db });
    await screen.findByRole('heading', { name: /New read/ });
    fireEvent.input(screen.getByLabelText('R-R count 1', { exact: true }), { target: { value: '20' } });
    fireEvent.input(screen.getByLabelText('QT count', { exact: true }), { target: { value: '10' } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign read as Ann Test' }));
    expect((await screen.findByText(/storage is full, so this was NOT saved/)).textContent).toContain('Your typing is kept on screen');
    expect((screen.getByLabelText('QT count', { exact: true }) as HTMLInputElement).value).toBe('10');
    expect((screen.getByLabelText('R-R count 1', { exact: true }) as HTMLInputElement).value).toBe('20');
    expect(screen.getByText(/Draft NOT saved: storage full/)).toBeTruthy();
    expect(await db.reads.count()).toBe(0);
  });
});
