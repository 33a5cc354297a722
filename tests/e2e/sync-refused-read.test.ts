// A read the unit server refuses for good: the nurse sees why next to the read and in the list of
// refused changes, marks it as seen, and nothing is dropped. Real server, one Chromium tablet.
// Invented ward, staff and patient.
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Tablet, UnitServer } from './support/e2e-harness.ts';
import { chromiumAvailable, createAccount, ensureAppBuilt, openTablet, startUnitServer } from './support/e2e-harness.ts';
import { addBed, adminApi, admit, connectAccount, joinWardAsAdmin, lockScreen, readRows, signSinusRead, snapshot, syncLine, unlockAs } from './sync-steps.ts';

const run = chromiumAvailable();

const admin = { username: 'admin', name: 'T. Admin', password: 'an invented admin passphrase' };
const ash = { username: 'ash', name: 'A. Ash', password: 'an invented nurse passphrase', role: 'nurse' as const };
const dee = { username: 'dee', name: 'D. Dee', password: 'a leaving nurse passphrase', role: 'nurse' as const };
const pins = { admin: '1357', ash: '2468', dee: '5791' };
const refusal = 'The clinician named on this change is not an active account on this unit.';

describe.runIf(run)('a read the unit server refuses', () => {
  let server: UnitServer;
  let tablet: Tablet;
  let page: Page;
  let api: Awaited<ReturnType<typeof adminApi>>;

  beforeAll(async () => {
    ensureAppBuilt();
    server = await startUnitServer({ admin });
    for (const account of [ash, dee]) createAccount(server.dataDir, account);
    api = await adminApi(server.url, admin);
    tablet = await openTablet();
    page = await tablet.context.newPage();
  });
  afterEach(async ({ task }) => {
    if (task.result?.state === 'fail') await snapshot(page, `failed-sync-refused-${task.name.slice(0, 40).replace(/\W+/g, '-')}`, true).catch(() => undefined);
  });
  afterAll(async () => {
    await tablet?.close();
    await server?.stop();
  });

  it('is refused when its author\'s account was closed after she signed in on the tablet, and the sync line says so', async () => {
    await joinWardAsAdmin(page, server.url, admin, 'Tablet 1, bay 2', pins.admin);
    await unlockAs(page, admin.name, pins.admin);
    await addBed(page, 'Bed 1');
    await admit(page, 'Bed 1', 'P.L.', 'Male');
    await expect.poll(() => syncLine(page), { timeout: 20_000 }).toMatch(/^All reads sent/);
    await connectAccount(page, dee, pins.dee);
    await connectAccount(page, ash, pins.ash);
    // D. Dee leaves the unit: the admin closes her account on the server. The tablet still unlocks for her with her PIN.
    const deeId = (await api.users()).find((u) => u.username === dee.username)!.id;
    await api.patchUser(deeId, { active: false });
    await lockScreen(page);
    await unlockAs(page, dee.name, pins.dee);
    await signSinusRead(page, 'Bed 1', dee.name, { rr: 20, pr: 4, qrs: 2, qt: 10 });
    await expect.poll(() => syncLine(page), { timeout: 20_000 }).toMatch(/^1 read refused by the server — open it to see why · last synced \d\d:\d\d$/);
    // Marked next to the read, with the server's reason.
    expect(await readRows(page).count()).toBe(1);
    await expect.poll(() => readRows(page).locator('.sync-rejected').textContent()).toBe(`Refused by the server: ${refusal}`);
    await snapshot(page, 'sync-refused-01-bed-page', true);
    // Nothing reached the server's log; the refusal is in its audit trail.
    expect((await api.changes()).filter((c) => c.kind === 'read.sign')).toHaveLength(0);
    expect((await api.audit('?kind=change.rejected')).map((e) => e.username)).toEqual([ash.username]);
  });

  it('opens the list of refused changes from the sync line, and a read marked as seen stays listed under "Seen" and on the bed', async () => {
    await page.getByRole('button', { name: 'Show refused' }).click();
    await page.getByRole('heading', { name: 'Changes the unit server refused' }).waitFor();
    const unseen = page.getByRole('list', { name: 'Refused changes not yet seen' }).getByRole('listitem');
    expect(await unseen.count()).toBe(1);
    expect(await unseen.getByRole('heading').textContent()).toMatch(/^Read · Bed 1, P\.L\. · strip time .+ · by D\. Dee$/);
    expect(await unseen.textContent()).toContain(`Why refused: ${refusal}`);
    await snapshot(page, 'sync-refused-02-list', true);
    await unseen.getByRole('button', { name: 'Mark as seen' }).click();
    const seen = page.getByRole('list', { name: 'Refused changes already seen' }).getByRole('listitem');
    await expect.poll(() => seen.textContent()).toContain('marked as seen by D. Dee');
    await expect.poll(() => syncLine(page)).toMatch(/^Nothing waiting to send · last synced \d\d:\d\d$/);
    expect(await page.getByRole('button', { name: 'Refused changes (1 seen)' }).isVisible()).toBe(true);
    await snapshot(page, 'sync-refused-03-seen');
    await seen.getByRole('link', { name: 'Open Bed 1' }).click();
    await expect.poll(() => readRows(page).locator('.sync-rejected').textContent()).toBe(`Refused by the server: ${refusal}`);
  });
});
