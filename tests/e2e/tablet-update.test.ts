// A new release of the tablet app reaches a tablet while a nurse is half-way through a read.
//
// How the new version is made: the app is built twice with the project's own Vite config, each
// build stamped with a label in index.html (tablet-build-variant.ts), so the second is a genuinely
// different release: a changed page, a changed precache list, a byte-different service worker. The
// unit server serves the first build, then is restarted on the same port (same origin) serving the
// second, as when a ward's server is upgraded. The tablet then runs the check the app itself runs
// every 30 minutes (registration.update()), with no test hook in the app. Everything after that is
// the real browser, the real service worker lifecycle and the app's own update bridge.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Tablet, UnitServer } from './support/e2e-harness.ts';
import { chromiumAvailable, openTablet, startUnitServer } from './support/e2e-harness.ts';
import { buildLabelMetaName } from './tablet-build-variant.ts';
import { countInput, saveScreenshot, unlock, waitForServiceWorkerControl } from './tablet-steps.ts';

const run = chromiumAvailable();

const nurse = { name: 'Ash R. (demo nurse)', pin: '1111' };
const demoBedRead = '#/beds/demo-bed-06/read';

function buildRelease(outDir: string, label: string): void {
  const result = spawnSync(process.execPath, ['--import', 'tsx', 'tests/e2e/tablet-build-variant.ts', outDir, label], {
    // Vitest sets NODE_ENV=test, which would make Vite emit a development build without the service worker.
    env: { ...process.env, NODE_ENV: 'production' },
    encoding: 'utf8',
  });
  if (result.status !== 0) throw new Error(`build of release ${label} failed (${result.status}): ${result.stderr}${result.stdout}`);
}

const releaseOf = (page: Page) => page.evaluate((name) => document.querySelector(`meta[name="${name}"]`)?.getAttribute('content') ?? null, buildLabelMetaName);
const hasWaitingWorker = (page: Page) => page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.waiting != null);

describe.runIf(run)('a new release while a read is half typed', () => {
  let releaseA: string;
  let releaseB: string;
  let server: UnitServer;
  let tablet: Tablet;
  let page: Page;

  beforeAll(async () => {
    releaseA = mkdtempSync(join(tmpdir(), 'rl-e2e-release-a-'));
    releaseB = mkdtempSync(join(tmpdir(), 'rl-e2e-release-b-'));
    buildRelease(releaseA, 'A');
    buildRelease(releaseB, 'B');
    server = await startUnitServer({ env: { DIST_DIR: releaseA } });
    tablet = await openTablet({ width: 1280, height: 800 });
    page = await tablet.context.newPage();
  });
  afterEach(async ({ task }) => {
    if (task.result?.state === 'fail') await saveScreenshot(page, `failed-update-${task.name.slice(0, 40).replace(/\W+/g, '-')}`, { fullPage: true }).catch(() => undefined);
  });
  afterAll(async () => {
    await tablet?.close();
    await server?.stop();
    for (const dir of [releaseA, releaseB]) if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('keeps a half-typed read as a draft on release A', async () => {
    await page.goto(server.url);
    await waitForServiceWorkerControl(page);
    expect(await releaseOf(page)).toBe('A');
    await page.getByRole('button', { name: 'Load the demo ward' }).click();
    await unlock(page, nurse.name, nurse.pin);
    await page.goto(new URL(demoBedRead, server.url).href);
    await page.getByRole('heading', { name: /^New read: Bed 6,/ }).waitFor();
    await countInput(page, 'R-R count 1').fill('22');
    await countInput(page, 'QT count').fill('11');
    // 1500 / 22 = 68.2 bpm; 11 small boxes = 440 ms at 25 mm/s (common practice, no source)
    await expect.poll(() => page.getByTestId('figure-rate').textContent()).toBe('68 bpm');
    await expect.poll(() => page.getByTestId('figure-qt').textContent()).toBe('440 ms');
    await page.getByRole('status').filter({ hasText: 'Draft saved on this tablet' }).waitFor();
  });

  it('offers release B but refuses to apply it under the half-typed read', async () => {
    const port = new URL(server.url).port;
    await server.stop();
    server = await startUnitServer({ env: { DIST_DIR: releaseB, PORT: port } });
    expect(new URL(server.url).port).toBe(port);
    // Marks this page load: a reload or an update taking over would lose it.
    await page.evaluate(() => Object.assign(window, { loadMarker: 'before-update' }));
    await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.update());
    await page.getByText('An update is ready.').waitFor();
    expect(await hasWaitingWorker(page)).toBe(true);

    await page.getByRole('button', { name: 'Apply update' }).click();
    await page.getByText('A read is being typed, so the update waits.').waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await saveScreenshot(page, '08-update-waits-for-read');
    expect(await hasWaitingWorker(page)).toBe(true);
    expect(await page.evaluate(() => (window as unknown as { loadMarker?: string }).loadMarker)).toBe('before-update');
    expect(await releaseOf(page)).toBe('A');
    expect(await countInput(page, 'R-R count 1').inputValue()).toBe('22');
    expect(await countInput(page, 'QT count').inputValue()).toBe('11');
  });

  it('still offers it, and still has the draft, after a reload with the update waiting', async () => {
    await page.reload();
    await unlock(page, nurse.name, nurse.pin);
    await page.getByRole('heading', { name: /^New read: Bed 6,/ }).waitFor();
    expect(await releaseOf(page)).toBe('A');
    await page.getByText('An update is ready.').waitFor();
    expect(await countInput(page, 'R-R count 1').inputValue()).toBe('22');
    expect(await countInput(page, 'QT count').inputValue()).toBe('11');
  });

  it('applies release B once the nurse leaves the read, and the draft is there in release B', async () => {
    await page.getByRole('button', { name: 'Apply update' }).click();
    await page.getByRole('button', { name: 'Apply after signing' }).click();
    await page.getByText(/applied when this read is signed or left \(your draft is kept\)/).waitFor();
    expect(await hasWaitingWorker(page)).toBe(true);

    await page.getByRole('link', { name: 'Leave (draft kept)' }).click();
    // The app reloads itself under the new worker.
    await page.waitForFunction((name) => document.querySelector(`meta[name="${name}"]`)?.getAttribute('content') === 'B', buildLabelMetaName, { timeout: 30_000 });
    expect(await hasWaitingWorker(page)).toBe(false);
    await unlock(page, nurse.name, nurse.pin);
    await page.goto(new URL(demoBedRead, server.url).href);
    await page.getByRole('heading', { name: /^New read: Bed 6,/ }).waitFor();
    expect(await countInput(page, 'R-R count 1').inputValue()).toBe('22');
    expect(await countInput(page, 'QT count').inputValue()).toBe('11');
    await expect.poll(() => page.getByTestId('figure-rate').textContent()).toBe('68 bpm');
    expect(await page.getByText('An update is ready.').count()).toBe(0);
  });
});
