import { screen, within } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { AppShell } from '../../src/app/AppShell.tsx';
import type { ClinicianRow } from '../../src/store/db.ts';
import { unit } from '../store/fixtures.ts';
import { nurse, renderCharting } from './charting-fixture.tsx';

// happy-dom lays nothing out, so these tests hold the header's structure; its single row at
// 1280 x 800 is checked on screenshots in Chromium.
const longUnit = { ...unit, name: 'Invented General Hospital · Ward 5 South Telemetry and Step-down' };
const admin: ClinicianRow = { ...nurse, id: 'clin-test-cy', name: 'Cy Test-Longername', role: 'unit-admin' };

describe('the header', () => {
  it('gives the full unit name to a title cut short on a narrow row', async () => {
    await renderCharting(<AppShell onLock={() => undefined} storage={null} />, { unit: longUnit, clinician: admin });
    const title = await screen.findByRole('link', { name: longUnit.name });
    expect(title.getAttribute('title')).toBe(longUnit.name);
    expect(title.closest('header')).toBeTruthy();
  });

  it('keeps who is charting and the lock together in one group', async () => {
    let locks = 0;
    await renderCharting(<AppShell onLock={() => (locks += 1)} storage={null} />, { unit: longUnit, clinician: admin });
    const who = await screen.findByRole('group', { name: 'Who is charting' });
    expect(who.textContent).toContain('Charting as Cy Test-Longername');
    within(who).getByRole('button', { name: 'Lock screen' }).click();
    expect(locks).toBe(1);
  });

  it('lists the four places of a unit admin in the menu, by their full names', async () => {
    await renderCharting(<AppShell onLock={() => undefined} storage={null} />, { unit: longUnit, clinician: admin });
    const menu = await screen.findByRole('navigation', { name: 'Main' });
    expect(within(menu).getAllByRole('link').map((a) => a.textContent)).toEqual(['Beds', 'Handover desk', 'Unit settings', 'Audit trail']);
  });

  it('says the storage state in a few words under the unit name, with the advice behind them', async () => {
    await renderCharting(<AppShell onLock={() => undefined} storage="not-granted" />, { unit: longUnit, clinician: admin });
    const words = await screen.findByText('Storage not guaranteed');
    expect(words.getAttribute('title')).toBe('Storage not guaranteed: install the app or keep it in use.');
    expect(words.closest('.top-place')?.querySelector('a')?.textContent).toBe(longUnit.name);
  });
});
