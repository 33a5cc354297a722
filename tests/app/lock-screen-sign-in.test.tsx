import { fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import { App } from '../../src/app/App.tsx';
import { verifyPin } from '../../src/store/clinicians.ts';
import { writeSetting } from '../../src/store/settings.ts';
import { saveServerAccount } from '../../src/sync/server-accounts.ts';
import { currentSession } from '../../src/sync/server-session.ts';
import { deviceKey, writeSyncSetting } from '../../src/sync/sync-settings.ts';
import { ManualClock, adminCy, connectionTo, engineFor, newServer, newTablet, nurseBay, t0, unit } from '../sync/sync-fixtures.ts';

function goTo(hash: string) {
  location.hash = hash;
  window.dispatchEvent(new HashChangeEvent('hashchange'));
}

/** A ward tablet whose unit came from the server, with one account (the unit admin) able to unlock it. */
async function wardTablet({ enrolled }: { enrolled: boolean }) {
  const server = await newServer();
  const clock = new ManualClock(t0);
  const db = await newTablet();
  await writeSetting(db, 'currentUnitId', unit.id);
  if (enrolled) await writeSyncSetting(db, deviceKey, { deviceId: 'device-1', deviceToken: 'device-token-1' });
  const { password: _password, ...admin } = adminCy;
  await saveServerAccount(db, { user: { ...admin, unitId: unit.id }, pin: '2468', iterations: 1_000 }, t0);
  const sync = await engineFor(db, server, clock);
  return { server, clock, db, sync, connection: connectionTo(server, clock) };
}

describe('signing in with a unit account from the lock screen', () => {
  afterEach(() => goTo('#/beds'));

  it('lets a nurse new to an enrolled tablet sign in, choose a PIN and start charting', async () => {
    const { db, sync, connection } = await wardTablet({ enrolled: true });
    goTo('#/beds');
    render(<App db={db} sync={sync} connection={connection} />);
    await screen.findByRole('heading', { name: 'Who is charting?' });
    expect(screen.queryByRole('button', { name: nurseBay.name })).toBeNull();

    fireEvent.click(screen.getByRole('button', { name: 'Sign in with your unit account' }));
    fireEvent.input(screen.getByLabelText('Username'), { target: { value: nurseBay.username } });
    fireEvent.input(screen.getByLabelText('Password'), { target: { value: nurseBay.password } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await screen.findByText('Choose a PIN for this tablet');
    fireEvent.input(screen.getByLabelText('PIN'), { target: { value: '1357' } });
    fireEvent.input(screen.getByLabelText('PIN again'), { target: { value: '1357' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save PIN' }));

    expect(await screen.findByRole('heading', { name: 'Beds now' })).toBeTruthy();
    expect(screen.getByText(nurseBay.name, { selector: 'strong' })).toBeTruthy();
    expect((await currentSession(db))?.user.id).toBe(nurseBay.id);
    // The PIN now unlocks this tablet offline for the same account.
    expect(await verifyPin(db, nurseBay.id, '1357')).toMatchObject({ id: nurseBay.id, name: nurseBay.name, role: 'nurse' });
  });

  it('goes back to the clinicians on the tablet without signing anyone in', async () => {
    const { db, sync, connection } = await wardTablet({ enrolled: true });
    goTo('#/beds');
    render(<App db={db} sync={sync} connection={connection} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Sign in with your unit account' }));
    expect(screen.getByRole('heading', { name: 'Sign in with your unit account' })).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Back to the clinicians on this tablet' }));
    expect(await screen.findByRole('button', { name: adminCy.name })).toBeTruthy();
    expect(await currentSession(db)).toBeNull();
  });

  it('offers no online sign-in on a tablet that no unit server has enrolled', async () => {
    const { db, sync, connection } = await wardTablet({ enrolled: false });
    goTo('#/beds');
    render(<App db={db} sync={sync} connection={connection} />);
    expect(await screen.findByRole('button', { name: adminCy.name })).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Sign in with your unit account' })).toBeNull();
  });
});
