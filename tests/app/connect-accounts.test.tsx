import { fireEvent, screen } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { UnitSettings } from '../../src/app/screens/UnitSettings.tsx';
import { verifyPin } from '../../src/store/clinicians.ts';
import type { ClinicianRow } from '../../src/store/db.ts';
import { ManualClock, connectionTo, engineFor, newServer, newTablet, nurseAsh, nurseBay, signInTablet, t0, unit } from '../sync/sync-fixtures.ts';
import { renderCharting } from './charting-fixture.tsx';

const chargeNurse: ClinicianRow = { id: 'user-dee', name: 'Dee Invented', role: 'charge-nurse', pinHash: 'x', pinSalt: 'x', pinIterations: 1, active: true, createdAtMs: 0 };

async function connectAccount(account: { username: string; password: string; name: string }, pin: string) {
  fireEvent.input(screen.getByLabelText('Username'), { target: { value: account.username } });
  fireEvent.input(screen.getByLabelText('Password'), { target: { value: account.password } });
  fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
  await screen.findByText('Choose a PIN for this tablet');
  fireEvent.input(screen.getByLabelText('PIN'), { target: { value: pin } });
  fireEvent.input(screen.getByLabelText('PIN again'), { target: { value: pin } });
  fireEvent.click(screen.getByRole('button', { name: 'Save PIN' }));
  await screen.findByText(`Signed in as ${account.name}. This tablet now syncs with the unit server.`);
}

describe('connecting accounts in Unit settings', () => {
  it('offers to connect another account after one is connected, without leaving the screen', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    const sync = await engineFor(db, server, clock);
    await renderCharting(<UnitSettings connection={connectionTo(server, clock)} />, { db, unit, clinician: chargeNurse, sync });

    fireEvent.click(await screen.findByText('Connect this tablet to the unit server'));
    await connectAccount(nurseAsh, '1357');
    fireEvent.click(screen.getByRole('button', { name: 'Connect another account' }));
    expect((screen.getByLabelText('Username') as HTMLInputElement).value).toBe('');
    await connectAccount(nurseBay, '2468');

    expect(await verifyPin(db, nurseAsh.id, '1357')).toMatchObject({ name: nurseAsh.name });
    expect(await verifyPin(db, nurseBay.id, '2468')).toMatchObject({ name: nurseBay.name });
    expect(screen.getByRole('heading', { name: 'Unit settings' })).toBeTruthy();
  });
});
