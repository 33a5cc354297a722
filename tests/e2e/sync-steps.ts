// Steps the sync browser tests share: joining a ward on the unit server, connecting accounts,
// charting on a bed, and reading the server's own record over its API. Driven by accessible names.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { e2eOutputDir } from './support/e2e-harness.ts';

/** Waits until the service worker controls the page, so going offline afterwards is a fair test. */
export async function waitForServiceWorker(page: Page): Promise<void> {
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 });
}

/** The first visit of a new tablet: a unit admin signs in, enrols the tablet and picks a PIN; ends on the lock screen. */
export async function joinWardAsAdmin(page: Page, url: string, admin: { username: string; password: string }, tabletLabel: string, pin: string): Promise<void> {
  await page.goto(url);
  await waitForServiceWorker(page);
  const join = page.locator('section.choice').filter({ has: page.getByRole('heading', { name: 'Join a ward on the unit server' }) });
  await join.getByLabel('Username').fill(admin.username);
  await join.getByLabel('Password').fill(admin.password);
  await join.getByRole('button', { name: 'Sign in' }).click();
  await join.getByLabel('Tablet name').fill(tabletLabel);
  await join.getByRole('button', { name: 'Enrol tablet' }).click();
  await choosePin(join, pin);
  // The first sync brings the unit, and the tablet opens on its lock screen.
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor({ timeout: 30_000 });
}

async function choosePin(scope: Locator, pin: string): Promise<void> {
  await scope.getByLabel('PIN', { exact: true }).fill(pin);
  await scope.getByLabel('PIN again').fill(pin);
  await scope.getByRole('button', { name: 'Save PIN' }).click();
}

/** Picks the clinician on the lock screen and types the PIN; ends behind the lock. */
export async function unlockAs(page: Page, name: string, pin: string): Promise<void> {
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor();
  await page.getByRole('button', { name, exact: true }).click();
  await page.getByLabel(`PIN for ${name}`).fill(pin);
  await page.getByRole('button', { name: 'Unlock' }).click();
  await page.getByRole('button', { name: 'Lock screen' }).waitFor();
}

/** Locks the tablet. */
export async function lockScreen(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Lock screen' }).click();
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor();
}

/** Opens a hash route of the app. */
export async function openRoute(page: Page, hash: string): Promise<void> {
  await page.evaluate((h) => {
    location.hash = h;
  }, hash);
}

/**
 * A charge nurse or unit admin, unlocked, signs another clinician in to the unit server on this
 * tablet from Unit settings; the clinician picks a PIN for offline unlock.
 */
export async function connectAccount(page: Page, account: { username: string; password: string; name: string }, pin: string): Promise<void> {
  // Settings opened afresh: after one account is connected, the form shows only its confirmation until the screen is left.
  await openRoute(page, '#/beds');
  await page.getByRole('heading', { name: 'Beds now' }).waitFor();
  await openRoute(page, '#/settings');
  await page.getByRole('heading', { name: 'Unit settings' }).waitFor();
  await page.getByText('Connect this tablet to the unit server').click();
  const form = page.locator('form.server-sign-in');
  await form.getByLabel('Username').fill(account.username);
  await form.getByLabel('Password').fill(account.password);
  await form.getByRole('button', { name: 'Sign in' }).click();
  await choosePin(page.locator('form.server-sign-in'), pin);
  await page.getByText(`Signed in as ${account.name}. This tablet now syncs with the unit server.`).waitFor();
}

/** Adds a bed from Unit settings (charge nurse or unit admin). */
export async function addBed(page: Page, label: string): Promise<void> {
  await openRoute(page, '#/settings');
  await page.getByLabel('New bed label').fill(label);
  await page.getByRole('button', { name: 'Add bed' }).click();
  await page.locator('.bed-edit input').first().waitFor();
}

/** The board card of one bed. */
export function bedCard(page: Page, bedLabel: string): Locator {
  return page.locator('li.bed-card').filter({ has: page.getByRole('heading', { name: new RegExp(`^${bedLabel}\\b`) }) });
}

/** Starts monitoring a patient on a bed from the board; ends on the bed page. */
export async function admit(page: Page, bedLabel: string, alias: string, sex: 'Female' | 'Male'): Promise<void> {
  await openRoute(page, '#/beds');
  await bedCard(page, bedLabel).getByRole('link', { name: 'Start monitoring' }).click();
  await page.getByLabel('Initials or alias (never the full name)').fill(alias);
  await page.getByLabel(sex, { exact: true }).check();
  await page.getByRole('button', { name: 'Start monitoring' }).click();
  await page.getByRole('heading', { name: `${bedLabel}: ${alias}` }).waitFor();
}

/** Box counts of one read, in small boxes at 25 mm/s. */
export interface Counts {
  rr: number;
  pr: number;
  qrs: number;
  qt: number;
}

/** Charts and signs one sinus-rhythm read on a bed; ends on the bed page with its confirmation. */
export async function signSinusRead(page: Page, bedLabel: string, clinicianName: string, counts: Counts): Promise<void> {
  await openRoute(page, '#/beds');
  await bedCard(page, bedLabel).getByRole('link', { name: /^(New read|Continue read)$/ }).click();
  await page.getByRole('heading', { name: new RegExp(`^New read: ${bedLabel},`) }).waitFor();
  await page.getByLabel('R-R count 1', { exact: true }).fill(String(counts.rr));
  await page.getByLabel('PR count', { exact: true }).fill(String(counts.pr));
  await page.getByLabel('QRS count', { exact: true }).fill(String(counts.qrs));
  await page.getByLabel('QT count', { exact: true }).fill(String(counts.qt));
  await page.getByLabel('Rhythm on the strip').selectOption({ label: 'Sinus rhythm' });
  await page.getByRole('button', { name: `Sign read as ${clinicianName}` }).click();
  await page.getByRole('status').filter({ hasText: /^Read saved:/ }).waitFor();
}

/** The words of the always-visible sync line (without the retry countdown). */
export function syncLine(page: Page): Promise<string | null> {
  return page.locator('.sync-status__text').textContent();
}

/** Rows of the bed page's read tables (this shift and earlier). */
export function readRows(page: Page): Locator {
  return page.locator('table.reads tbody tr');
}

/** Saves a screenshot under the e2e output folder; returns its path. */
export async function snapshot(page: Page, name: string, fullPage = false): Promise<string> {
  mkdirSync(e2eOutputDir, { recursive: true });
  const path = join(e2eOutputDir, `${name}.png`);
  await page.screenshot({ path, fullPage });
  return path;
}

/** A pulled change as the server's API returns it. */
export interface ApiChange {
  seq: number;
  changeId: string;
  kind: string;
  record: { id: string; authorId?: string; authorName?: string; stayId?: string };
}

/** The unit server's API as a unit admin on a test desk tablet enrolled for the purpose. */
export async function adminApi(baseUrl: string, admin: { username: string; password: string }) {
  const call = async (path: string, init: { method?: string; body?: unknown; headers?: Record<string, string> } = {}) => {
    const response = await fetch(new URL(path, baseUrl), {
      method: init.method ?? 'GET',
      headers: { accept: 'application/json', ...(init.body === undefined ? {} : { 'content-type': 'application/json' }), ...init.headers },
      ...(init.body === undefined ? {} : { body: JSON.stringify(init.body) }),
    });
    const text = await response.text();
    if (response.status >= 300) throw new Error(`${init.method ?? 'GET'} ${path} answered ${response.status}: ${text}`);
    return text === '' ? null : (JSON.parse(text) as unknown);
  };
  const signedIn = (await call('/api/auth/sign-in', { method: 'POST', body: { username: admin.username, password: admin.password } })) as { token: string };
  const session = { authorization: `Bearer ${signedIn.token}` };
  const enrolled = (await call('/api/devices/enroll', { method: 'POST', body: { label: 'Test desk' }, headers: session })) as { deviceToken: string };
  const headers = { ...session, 'x-device-token': enrolled.deviceToken };
  return {
    /** Every change of the unit, in server order. */
    async changes(): Promise<ApiChange[]> {
      const all: ApiChange[] = [];
      let after = '0';
      for (;;) {
        const page = (await call(`/api/sync/pull?after=${after}&limit=500`, { headers })) as { changes: ApiChange[]; cursor: string; hasMore: boolean };
        all.push(...page.changes);
        after = page.cursor;
        if (!page.hasMore) return all;
      }
    },
    async users(): Promise<Array<{ id: string; username: string; name: string }>> {
      return ((await call('/api/users', { headers })) as { users: Array<{ id: string; username: string; name: string }> }).users;
    },
    async patchUser(id: string, body: Record<string, unknown>): Promise<void> {
      await call(`/api/users/${encodeURIComponent(id)}`, { method: 'PATCH', body, headers });
    },
    async audit(query = ''): Promise<Array<{ kind: string; username: string | null; deviceId: string | null }>> {
      return ((await call(`/api/audit${query}`, { headers })) as { events: Array<{ kind: string; username: string | null; deviceId: string | null }> }).events;
    },
  };
}
