// The ward tablet from its first visit to a shift's work with no network: the service worker serves
// the app, the ward is set up on the tablet, reads are logged and found again after offline reloads.
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Tablet, UnitServer } from './support/e2e-harness.ts';
import { chromiumAvailable, ensureAppBuilt, openTablet, startUnitServer } from './support/e2e-harness.ts';
import {
  admitPatient,
  bedCard,
  countInput,
  openNewRead,
  saveScreenshot,
  setStripTime,
  setUpWard,
  signRead,
  unlock,
  waitForServiceWorkerControl,
  wardClock,
} from './tablet-steps.ts';

const run = chromiumAvailable();

// An invented ward and invented patients (initials only).
const ward = {
  wardName: 'Ward 3 East Telemetry (Kestrel Bay Infirmary)',
  timeZone: 'Europe/Dublin',
  shiftPatternLabel: '3 × 8 h: Early 07:00, Late 15:00, Night 23:00',
  readIntervalHours: 4,
  bedLabels: ['Bed 1', 'Bed 2', 'Bed 3', 'Bed 4', 'Bed 5', 'Bed 6', 'Bed 7', 'Bed 8'],
  clinicianName: 'N. Okafor',
  pin: '4826',
};

describe.runIf(run)('the ward tablet offline, from the first visit', () => {
  let server: UnitServer;
  let tablet: Tablet;
  let page: Page;

  beforeAll(async () => {
    ensureAppBuilt();
    server = await startUnitServer();
    // A tablet set up as the ward's would be: Irish English, the ward's clock.
    tablet = await openTablet({ width: 1280, height: 800 }, { locale: 'en-IE', timezoneId: ward.timeZone });
    page = await tablet.context.newPage();
  });
  // A failed step leaves a picture of the screen it failed on.
  afterEach(async ({ task }) => {
    if (task.result?.state === 'fail') await saveScreenshot(page, `failed-${task.name.slice(0, 40).replace(/\W+/g, '-')}`, { fullPage: true }).catch(() => undefined);
  });
  afterAll(async () => {
    await tablet?.close();
    await server?.stop();
  });

  it('opens with no network once the first visit has installed the service worker', async () => {
    await page.goto(server.url);
    await waitForServiceWorkerControl(page);
    await tablet.context.setOffline(true);
    // The network is really gone: the unit server cannot be reached from the page.
    const reachable = await page.evaluate(() => fetch('/api/health').then(() => true, () => false));
    expect(reachable).toBe(false);
    await page.reload();
    await expect.poll(() => page.getByRole('button', { name: 'Set up this ward' }).isVisible()).toBe(true);
    expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
    await saveScreenshot(page, '01-first-run');
  });

  it('sets up a ward offline through the first run: name, time zone, 3 x 8 h shifts, q4h, eight beds, a clinician with a PIN', async () => {
    await setUpWard(page, ward);
    expect(await page.locator('.lock-unit').textContent()).toBe(ward.wardName);
    await expect.poll(() => page.getByRole('button', { name: ward.clinicianName, exact: true }).isVisible()).toBe(true);
    await saveScreenshot(page, '02-lock-screen');
    await unlock(page, ward.clinicianName, ward.pin);
    await page.getByRole('heading', { name: 'Beds now' }).waitFor();
    expect(await page.locator('li.bed-card').count()).toBe(8);
    expect(await page.locator('li.bed-empty').count()).toBe(8);
  });

  it('admits a female patient with a baseline QTc on Bed 1 and a male patient on Bed 2', async () => {
    await admitPatient(page, 'Bed 1', { alias: 'K.M.', sex: 'Female', ageBand: '70+', baselineQtcMs: 440 });
    expect(await page.locator('.stay-facts-list').textContent()).toContain('Baseline QTc 440 ms');
    await admitPatient(page, 'Bed 2', { alias: 'R.T.', sex: 'Male', ageBand: '40-69' });
    expect(await page.locator('.stay-facts-list').textContent()).toContain('Male');
  });

  it('shows each figure as the counts are typed and signs a first read on Bed 1', async () => {
    await openNewRead(page, 'Bed 1');
    const stripMs = Date.now() - 30 * 60_000;
    await setStripTime(page, stripMs, ward.timeZone);
    // Whatever the pickers' language, the strip time is echoed on the 24-hour ward clock.
    expect(await page.locator('.strip-time-words').textContent()).toMatch(new RegExp(`^Strip time: \\w{3} \\d{1,2} \\w{3}, ${wardClock(stripMs, ward.timeZone).time} \\(24-hour ward clock\\)$`));
    await countInput(page, 'R-R count 1').fill('20');
    // 1500 / 20 small boxes = 75 bpm at 25 mm/s (common practice, no source; clinical reference 1.x: the 1500 rule)
    await expect.poll(() => page.getByTestId('figure-rate').textContent()).toBe('75 bpm');
    await countInput(page, 'PR count').fill('4');
    // 4 small boxes x 40 ms = 160 ms at 25 mm/s (common practice, no source)
    await expect.poll(() => page.getByTestId('figure-pr').textContent()).toBe('160 ms');
    await countInput(page, 'QRS count').fill('2');
    await expect.poll(() => page.getByTestId('figure-qrs').textContent()).toBe('80 ms');
    await countInput(page, 'QT count').fill('10');
    await expect.poll(() => page.getByTestId('figure-qt').textContent()).toBe('400 ms');
    // Fridericia: 400 / 0.8^(1/3) = 430.9 ms (Fridericia 1920, The duration of systole in an electrocardiogram...)
    await expect.poll(() => page.getByTestId('figure-qtc').textContent()).toBe('431 ms');
    expect(await page.locator('.banner-urgent').count()).toBe(0);
    await page.getByLabel('Rhythm on the strip').selectOption({ label: 'Sinus rhythm' });
    await signRead(page, ward.clinicianName);
    expect(await page.locator('table.reads tbody tr').count()).toBe(1);
  });

  it('gives an URGENT banner naming the 500 ms limit and its source when QT 13 small boxes gives a Fridericia QTc of 560 ms', async () => {
    await openNewRead(page, 'Bed 1');
    await countInput(page, 'R-R count 1').fill('20');
    await expect.poll(() => page.getByTestId('figure-rate').textContent()).toBe('75 bpm');
    await countInput(page, 'PR count').fill('4');
    await countInput(page, 'QRS count').fill('2');
    await countInput(page, 'QT count').fill('13');
    await expect.poll(() => page.getByTestId('figure-qt').textContent()).toBe('520 ms');
    // Fridericia: 520 / 0.8^(1/3) = 560.2 ms (Fridericia 1920); >= 500 ms is high risk (Drew et al. 2010, > 500;
    // AACN Practice Alert 2016, >= 500; the unit policy flags 500 itself).
    await expect.poll(() => page.getByTestId('figure-qtc').textContent()).toBe('560 ms');
    const highRisk = page.locator('.banner-urgent').filter({ hasText: 'limit of 500 ms' });
    await expect.poll(() => highRisk.count()).toBe(1);
    const bannerText = (await highRisk.textContent()) ?? '';
    expect(bannerText).toContain('URGENT');
    expect(bannerText).toContain('560 ms');
    expect(bannerText).toContain('Drew et al. 2010');
    // The rise from the 440 ms baseline (120 ms) and since the last read (431 to 560) exceed 60 ms (Drew et al. 2010).
    const riseFromBaseline = page.locator('.banner-urgent').filter({ hasText: 'from the baseline of 440 ms' });
    expect(await riseFromBaseline.count()).toBe(1);
    // The banner names the rise as a rise, never as if the QTc itself were 120 ms.
    expect(await riseFromBaseline.locator('.banner-figures').textContent()).toContain('QTc (Fridericia) rise from baseline: 120 ms');
    await page.getByLabel('Rhythm on the strip').selectOption({ label: 'Sinus rhythm' });
    await page.evaluate(() => window.scrollTo(0, 0));
    await saveScreenshot(page, '05-new-read-urgent');
    await saveScreenshot(page, '05-new-read-urgent-full', { fullPage: true });
    await signRead(page, ward.clinicianName);
    expect(await page.locator('table.reads tbody tr').count()).toBe(2);
  });

  it('signs a read without flags on Bed 2', async () => {
    await openNewRead(page, 'Bed 2');
    await countInput(page, 'R-R count 1').fill('16');
    // 1500 / 16 = 93.75, shown half-up as 94 bpm (common practice, no source)
    await expect.poll(() => page.getByTestId('figure-rate').textContent()).toBe('94 bpm');
    await countInput(page, 'PR count').fill('3.5');
    await expect.poll(() => page.getByTestId('figure-pr').textContent()).toBe('140 ms');
    await countInput(page, 'QRS count').fill('2.5');
    await expect.poll(() => page.getByTestId('figure-qrs').textContent()).toBe('100 ms');
    await countInput(page, 'QT count').fill('9');
    // Fridericia: 360 / 0.64^(1/3) = 417.7 ms (Fridericia 1920)
    await expect.poll(() => page.getByTestId('figure-qtc').textContent()).toBe('418 ms');
    await page.getByLabel('Rhythm on the strip').selectOption({ label: 'Sinus rhythm' });
    expect(await page.locator('.banner').count()).toBe(0);
    await signRead(page, ward.clinicianName);
  });

  it('finds the three reads on the bed pages and the urgent flag on the board after an offline reload', async () => {
    await page.goto(new URL('#/beds', server.url).href);
    await page.reload();
    await unlock(page, ward.clinicianName, ward.pin);
    await page.getByRole('heading', { name: 'Beds now' }).waitFor();
    // Urgent first: Bed 1 heads the board with its urgent flags counted in words.
    const firstCard = page.locator('li.bed-card').first();
    expect(await firstCard.getByRole('heading').textContent()).toContain('Bed 1');
    expect(await bedCard(page, 'Bed 1').locator('.bed-flags').textContent()).toMatch(/\d URGENT/);
    expect(await bedCard(page, 'Bed 2').locator('.bed-flags').textContent()).toBe('No flags on the last read');
    await saveScreenshot(page, '03-beds-now');

    await bedCard(page, 'Bed 1').getByRole('link', { name: /open the bed/ }).click();
    await page.getByRole('heading', { name: 'Bed 1: K.M.' }).waitFor();
    const bed1Rows = page.locator('table.reads tbody tr');
    expect(await bed1Rows.count()).toBe(2);
    expect(await bed1Rows.first().textContent()).toContain('560');
    expect(await page.locator('.trends svg').count()).toBeGreaterThan(0);
    await saveScreenshot(page, '04-bed-page-full', { fullPage: true });
    await page.getByRole('heading', { name: 'Trends' }).evaluate((h) => h.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, '04-bed-page-trends');

    await page.goto(new URL('#/beds', server.url).href);
    await bedCard(page, 'Bed 2').getByRole('link', { name: /open the bed/ }).click();
    await page.getByRole('heading', { name: 'Bed 2: R.T.' }).waitFor();
    expect(await page.locator('table.reads tbody tr').count()).toBe(1);
    expect(await page.locator('table.reads tbody tr').first().textContent()).toContain('418');
  });

  it('keeps a half-typed read through a reload offline and another online', async () => {
    await openNewRead(page, 'Bed 2');
    await countInput(page, 'R-R count 1').fill('18');
    await countInput(page, 'QT count').fill('9.5');
    await page.getByRole('status').filter({ hasText: 'Draft saved on this tablet' }).waitFor();

    for (const offline of [true, false]) {
      await tablet.context.setOffline(offline);
      await page.reload();
      await unlock(page, ward.clinicianName, ward.pin);
      await page.goto(new URL('#/beds', server.url).href);
      expect(await bedCard(page, 'Bed 2').locator('.draft-tag').textContent()).toBe('Your unsigned draft');
      await openNewRead(page, 'Bed 2');
      expect(await countInput(page, 'R-R count 1').inputValue()).toBe('18');
      expect(await countInput(page, 'QT count').inputValue()).toBe('9.5');
    }
  });

  it('amends the urgent read beside the original, and shows the unit settings', async () => {
    await tablet.context.setOffline(true);
    await page.goto(new URL('#/beds', server.url).href);
    await bedCard(page, 'Bed 1').getByRole('link', { name: /open the bed/ }).click();
    await page.locator('table.reads tbody tr').first().getByRole('link', { name: 'Amend or view history' }).click();
    await page.getByRole('heading', { name: /^Amend a signed read/ }).waitFor();
    await countInput(page, 'QT count').fill('12.5');
    // 500 ms at R-R 800 ms: Fridericia 538.6 ms (Fridericia 1920), still at or above 500 ms.
    await expect.poll(() => page.getByTestId('figure-qtc').textContent()).toBe('539 ms');
    await page.getByLabel('Why is the read amended? (required)').fill('QT re-measured on the longest lead');
    await page.evaluate(() => window.scrollTo(0, 0));
    await saveScreenshot(page, '06-amend');
    await saveScreenshot(page, '06-amend-full', { fullPage: true });
    await page.getByRole('button', { name: `Save amendment as ${ward.clinicianName}` }).click();
    await page.getByRole('heading', { name: 'Bed 1: K.M.' }).waitFor();
    expect(await page.locator('table.reads tbody tr').first().textContent()).toContain('Amended (1)');
    expect(await page.locator('table.reads tbody tr').first().textContent()).toContain('539');

    await page.getByRole('link', { name: 'Unit settings' }).click();
    await page.getByRole('heading', { name: 'Unit settings' }).waitFor();
    await saveScreenshot(page, '07-settings');
  });
});
