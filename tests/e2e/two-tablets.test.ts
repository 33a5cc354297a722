// Two ward tablets and one unit server, all real: tablet B charts offline while tablet A charts
// online on the same bed; once B is back, both tablets and the server hold the same reads, and a
// charge nurse on a third tablet sees both nurses' work. Invented ward, staff and patient.
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Tablet, UnitServer } from './support/e2e-harness.ts';
import { chromiumAvailable, createAccount, ensureAppBuilt, openTablet, startUnitServer } from './support/e2e-harness.ts';
import type { ApiChange } from './sync-steps.ts';
import { addBed, adminApi, admit, bedCard, connectAccount, joinWardAsAdmin, lockScreen, openRoute, readRows, signSinusRead, snapshot, syncLine, unlockAs } from './sync-steps.ts';

const run = chromiumAvailable();

const admin = { username: 'admin', name: 'T. Admin', password: 'an invented admin passphrase' };
const ash = { username: 'ash', name: 'A. Ash', password: 'an invented nurse passphrase', role: 'nurse' as const };
const bay = { username: 'bay', name: 'B. Bay', password: 'another invented passphrase', role: 'nurse' as const };
const cole = { username: 'cole', name: 'C. Cole', password: 'a charge nurse passphrase', role: 'charge-nurse' as const };
const pins = { admin: '1357', ash: '2468', bay: '8642', cole: '9753' };
const allSent = /^All reads sent · last synced \d\d:\d\d$/;

/** Author names of the reads listed on a bed page, sorted, e.g. ["A. Ash", "A. Ash", "B. Bay"]. */
async function authorsOnBedPage(page: Page): Promise<string[]> {
  const cells = await readRows(page).locator('td:nth-child(8) .sub').allTextContents();
  return cells.map((c) => c.replace(/^ · /, '')).sort();
}

/** Strip time and author of each read on a bed page, sorted: the same list on two tablets means the same reads. */
async function readsOnBedPage(page: Page): Promise<string[]> {
  const rows = await readRows(page).all();
  const keys = await Promise.all(rows.map(async (row) => `${await row.locator('th').textContent()} · ${await row.locator('td:nth-child(8) .sub').textContent()}`));
  return keys.sort();
}

async function openBed(page: Page, bedLabel: string): Promise<void> {
  await openRoute(page, '#/beds');
  await bedCard(page, bedLabel).getByRole('link', { name: new RegExp(`^${bedLabel}`) }).first().click();
  await page.getByRole('heading', { name: new RegExp(`^${bedLabel}: `) }).waitFor();
}

describe.runIf(run)('two tablets on one bed with the unit server', () => {
  let server: UnitServer;
  let tabletA: Tablet;
  let tabletB: Tablet;
  let tabletC: Tablet | undefined;
  let pageA: Page;
  let pageB: Page;
  let pageC: Page | undefined;
  let api: Awaited<ReturnType<typeof adminApi>>;
  const readsOnServer = async (): Promise<ApiChange[]> => (await api.changes()).filter((c) => c.kind === 'read.sign');

  beforeAll(async () => {
    ensureAppBuilt();
    server = await startUnitServer({ admin });
    for (const account of [ash, bay, cole]) createAccount(server.dataDir, account);
    api = await adminApi(server.url, admin);
    tabletA = await openTablet();
    tabletB = await openTablet();
    pageA = await tabletA.context.newPage();
    pageB = await tabletB.context.newPage();
  });
  afterEach(async ({ task }) => {
    if (task.result?.state !== 'fail') return;
    const name = task.name.slice(0, 40).replace(/\W+/g, '-');
    for (const [label, page] of [['a', pageA], ['b', pageB], ['c', pageC]] as const) if (page) await snapshot(page, `failed-two-tablets-${label}-${name}`, true).catch(() => undefined);
  });
  afterAll(async () => {
    await tabletC?.close();
    await tabletB?.close();
    await tabletA?.close();
    await server?.stop();
  });

  it('tablet A joins the ward: the unit admin enrols it, adds Bed 1, admits a patient and connects nurse A. Ash', async () => {
    await joinWardAsAdmin(pageA, server.url, admin, 'Tablet A, bay 1', pins.admin);
    await unlockAs(pageA, admin.name, pins.admin);
    await addBed(pageA, 'Bed 1');
    await admit(pageA, 'Bed 1', 'K.M.', 'Female');
    // The bed and the admission go out under the admin's session before a nurse signs in here.
    await expect.poll(() => syncLine(pageA), { timeout: 20_000 }).toMatch(allSent);
    await connectAccount(pageA, ash, pins.ash);
    await lockScreen(pageA);
    await unlockAs(pageA, ash.name, pins.ash);
    const changes = await api.changes();
    expect(changes.map((c) => c.kind)).toEqual(['unit.put', 'bed.put', 'stay.put']);
  });

  it('tablet B joins the same way, connects nurse B. Bay and pulls Bed 1 with its patient', async () => {
    await joinWardAsAdmin(pageB, server.url, admin, 'Tablet B, bay 1', pins.admin);
    await unlockAs(pageB, admin.name, pins.admin);
    await connectAccount(pageB, bay, pins.bay);
    await lockScreen(pageB);
    await unlockAs(pageB, bay.name, pins.bay);
    await openRoute(pageB, '#/beds');
    await expect.poll(() => bedCard(pageB, 'Bed 1').textContent()).toContain('K.M.');
    await expect.poll(() => syncLine(pageB)).toMatch(allSent);
  });

  it('tablet B, offline, keeps two reads waiting and says so; tablet A sends its three at once', async () => {
    await tabletB.context.setOffline(true);
    expect(await pageB.evaluate(() => fetch('/api/health').then(() => true, () => false))).toBe(false);
    // 1500 / 18 small boxes = 83 bpm at 25 mm/s (common practice, no source).
    await signSinusRead(pageB, 'Bed 1', bay.name, { rr: 18, pr: 4, qrs: 2, qt: 9 });
    await signSinusRead(pageB, 'Bed 1', bay.name, { rr: 19, pr: 4, qrs: 2, qt: 9 });
    await expect.poll(() => syncLine(pageB), { timeout: 20_000 }).toBe('2 waiting to send — offline; they send by themselves when the network is back');
    expect(await readRows(pageB).count()).toBe(2);
    expect(await readRows(pageB).locator('.sync-pending').allTextContents()).toEqual(['Waiting to send', 'Waiting to send']);
    await snapshot(pageB, 'two-tablets-01-tablet-b-offline-waiting');

    for (const rr of [20, 21, 22]) await signSinusRead(pageA, 'Bed 1', ash.name, { rr, pr: 4, qrs: 2, qt: 10 });
    await expect.poll(() => syncLine(pageA), { timeout: 20_000 }).toMatch(allSent);
    expect(await readsOnServer()).toHaveLength(3);
  });

  it('tablet B back online sends its reads by itself; both tablets and the server end with the same 5 reads', async () => {
    await tabletB.context.setOffline(false);
    await expect.poll(() => syncLine(pageB), { timeout: 30_000 }).toMatch(allSent);
    await pageA.getByRole('button', { name: 'Sync now' }).click();
    await expect.poll(() => syncLine(pageA), { timeout: 20_000 }).toMatch(allSent);

    const onServer = await readsOnServer();
    expect(onServer).toHaveLength(5);
    expect(new Set(onServer.map((c) => c.record.id)).size).toBe(5);
    expect(onServer.map((c) => c.record.authorName).sort()).toEqual([ash.name, ash.name, ash.name, bay.name, bay.name]);

    for (const page of [pageA, pageB]) {
      await openBed(page, 'Bed 1');
      await expect.poll(() => readRows(page).count()).toBe(5);
      expect(await readRows(page).locator('.sync-accepted').count()).toBe(5);
    }
    expect(await readsOnBedPage(pageA)).toEqual(await readsOnBedPage(pageB));
    expect(await authorsOnBedPage(pageB)).toEqual([ash.name, ash.name, ash.name, bay.name, bay.name]);
    await snapshot(pageB, 'two-tablets-02-tablet-b-bed-after-sync', true);
  });

  it('a charge nurse on a third tablet sees both nurses\' reads, and the unit admin finds them in the audit trail', async () => {
    // Tablet B is done; closing it keeps the machine's memory for the third.
    await tabletB.close();
    tabletC = await openTablet();
    pageC = await tabletC.context.newPage();
    await joinWardAsAdmin(pageC, server.url, admin, 'Tablet C, charge desk', pins.admin);
    await unlockAs(pageC, admin.name, pins.admin);
    await connectAccount(pageC, cole, pins.cole);
    await lockScreen(pageC);
    await unlockAs(pageC, cole.name, pins.cole);
    // The audit trail is for unit admins only: a charge nurse has no way to it.
    expect(await pageC.getByRole('link', { name: 'Audit trail' }).count()).toBe(0);
    await openBed(pageC, 'Bed 1');
    await expect.poll(() => readRows(pageC!).count()).toBe(5);
    expect(await authorsOnBedPage(pageC)).toEqual([ash.name, ash.name, ash.name, bay.name, bay.name]);
    expect(await readsOnBedPage(pageC)).toEqual(await readsOnBedPage(pageA));
    await snapshot(pageC, 'two-tablets-03-charge-nurse-bed', true);

    // The audit trail: the admin unlocks, the tablet's session is the charge nurse's, so the screen asks the admin to sign in.
    await lockScreen(pageC);
    await unlockAs(pageC, admin.name, pins.admin);
    await pageC.getByRole('link', { name: 'Audit trail' }).click();
    const signIn = pageC.locator('form.server-sign-in');
    await signIn.getByLabel('Username').fill(admin.username);
    await signIn.getByLabel('Password').fill(admin.password);
    await signIn.getByRole('button', { name: 'Sign in' }).click();
    await pageC.getByLabel('What happened').selectOption({ label: 'Read signed' });
    await pageC.getByRole('button', { name: 'Show events' }).click();
    await expect.poll(() => pageC!.locator('table.audit-table caption').textContent()).toBe('Page 1: 5 events');
    const tablets = await pageC.locator('table.audit-table tbody tr td:nth-child(5)').allTextContents();
    expect(tablets.sort()).toEqual(['Tablet A, bay 1', 'Tablet A, bay 1', 'Tablet A, bay 1', 'Tablet B, bay 1', 'Tablet B, bay 1']);
    await snapshot(pageC, 'two-tablets-04-audit-trail', true);
  });
});
