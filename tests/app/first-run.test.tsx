import { fireEvent, render, screen, waitFor } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { App } from '../../src/app/App.tsx';
import { newTestDb } from '../store/fixtures.ts';

describe('first run on a new tablet', () => {
  it('sets up the ward, its beds and the first clinician in three steps, then locks', async () => {
    const db = newTestDb();
    render(<App db={db} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Set up this ward' }));
    fireEvent.input(screen.getByLabelText('Ward name'), { target: { value: 'Ward 9 telemetry' } });
    fireEvent.input(screen.getByLabelText('Time zone (the ward clock)'), { target: { value: 'Europe/London' } });
    fireEvent.click(screen.getByRole('button', { name: 'Next' }));
    fireEvent.input(screen.getByLabelText('Bed labels, one per line'), { target: { value: 'Bed 1\nBed 2\nSide room' } });
    fireEvent.click(screen.getByRole('button', { name: 'Next' }));
    fireEvent.input(screen.getByLabelText('Your name as the team knows it'), { target: { value: 'Ann Test' } });
    fireEvent.input(screen.getByLabelText('Choose a PIN (4 to 8 digits)'), { target: { value: '12' } });
    fireEvent.click(screen.getByRole('button', { name: 'Finish set-up' }));
    expect((await screen.findByRole('alert')).textContent).toBe('PIN: choose 4 to 8 digits.');
    expect(await db.units.count()).toBe(0);

    fireEvent.input(screen.getByLabelText('Choose a PIN (4 to 8 digits)'), { target: { value: '1234' } });
    fireEvent.click(screen.getByRole('button', { name: 'Finish set-up' }));
    expect(await screen.findByRole('heading', { name: 'Who is charting?' }, { timeout: 5000 })).toBeTruthy();
    await waitFor(async () => expect((await db.beds.toArray()).map((b) => b.label).sort()).toEqual(['Bed 1', 'Bed 2', 'Side room']));
    expect((await db.units.toArray())[0]).toMatchObject({ name: 'Ward 9 telemetry', timeZone: 'Europe/London', readIntervalHours: 4 });
    expect((await db.clinicians.toArray())[0]).toMatchObject({ name: 'Ann Test', role: 'unit-admin' });
  });

  it('loads the invented demo ward and shows its demo PINs on the lock screen', async () => {
    const db = newTestDb();
    render(<App db={db} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Load the demo ward' }));
    expect(await screen.findByText(/Demo PINs:/, {}, { timeout: 10_000 })).toBeTruthy();
    expect(screen.getByText(/Harbourside General/)).toBeTruthy();
  });
});
