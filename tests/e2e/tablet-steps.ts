// Steps the tablet browser tests share: a nurse's actions on the ward tablet, driven by accessible names.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { e2eOutputDir } from './support/e2e-harness.ts';

/** Waits until the service worker controls the page, so going offline afterwards is a fair test. */
export async function waitForServiceWorkerControl(page: Page): Promise<void> {
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 });
}

/** A ward set up on the tablet's first run. */
export interface WardSetUp {
  wardName: string;
  timeZone: string;
  /** The shift pattern's radio label as the first run shows it. */
  shiftPatternLabel: string;
  readIntervalHours: number;
  bedLabels: string[];
  clinicianName: string;
  pin: string;
}

/** The three steps of the first run: the ward, its beds, the first clinician. Ends on the lock screen. */
export async function setUpWard(page: Page, ward: WardSetUp): Promise<void> {
  await page.getByRole('button', { name: 'Set up this ward' }).click();
  await page.getByLabel('Ward name').fill(ward.wardName);
  await page.getByLabel('Time zone (the ward clock)').fill(ward.timeZone);
  await page.getByLabel(ward.shiftPatternLabel).check();
  await page.getByLabel('Read interval (hours)').fill(String(ward.readIntervalHours));
  await page.getByRole('button', { name: 'Next' }).click();
  await page.getByLabel('Bed labels, one per line').fill(ward.bedLabels.join('\n'));
  await page.getByRole('button', { name: 'Next' }).click();
  await page.getByLabel('Your name as the team knows it').fill(ward.clinicianName);
  await page.getByLabel('Choose a PIN (4 to 8 digits)').fill(ward.pin);
  await page.getByRole('button', { name: 'Finish set-up' }).click();
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor();
}

/** Picks the clinician on the lock screen and types the PIN; ends on the beds board. */
export async function unlock(page: Page, clinicianName: string, pin: string): Promise<void> {
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor();
  await page.getByRole('button', { name: clinicianName, exact: true }).click();
  await page.getByLabel(`PIN for ${clinicianName}`).fill(pin);
  await page.getByRole('button', { name: 'Unlock' }).click();
  await page.getByRole('button', { name: 'Lock screen' }).waitFor();
}

/** The board card of one bed. */
export function bedCard(page: Page, bedLabel: string): Locator {
  return page.locator('li.bed-card').filter({ has: page.getByRole('heading', { name: new RegExp(`^${bedLabel}\\b`) }) });
}

/** A patient's facts at admission. */
export interface Admission {
  alias: string;
  sex: 'Female' | 'Male' | 'Not recorded';
  ageBand?: string;
  baselineQtcMs?: number;
}

/** Starts monitoring a patient on a bed from the board; ends on the bed page. */
export async function admitPatient(page: Page, bedLabel: string, patient: Admission): Promise<void> {
  await page.goto(new URL('#/beds', page.url()).href);
  await bedCard(page, bedLabel).getByRole('link', { name: 'Start monitoring' }).click();
  await page.getByLabel('Initials or alias (never the full name)').fill(patient.alias);
  await page.getByLabel(patient.sex, { exact: true }).check();
  if (patient.ageBand) await page.getByLabel(patient.ageBand, { exact: true }).check();
  if (patient.baselineQtcMs !== undefined) await page.getByLabel('Baseline QTc in ms (optional, 200 to 800)').fill(String(patient.baselineQtcMs));
  await page.getByRole('button', { name: 'Start monitoring' }).click();
  await page.getByRole('heading', { name: `${bedLabel}: ${patient.alias}` }).waitFor();
}

/** Opens the new-read form of a bed from the board. */
export async function openNewRead(page: Page, bedLabel: string): Promise<void> {
  await page.goto(new URL('#/beds', page.url()).href);
  await bedCard(page, bedLabel).getByRole('link', { name: /^(New read|Continue read)$/ }).click();
  await page.getByRole('heading', { name: new RegExp(`^New read: ${bedLabel},`) }).waitFor();
}

/** A count input of the read form (exact label, so the stepper buttons beside it are not matched). */
export function countInput(page: Page, label: string): Locator {
  return page.getByLabel(label, { exact: true });
}

/** The strip date and time as the ward clock shows them ('yyyy-MM-dd', 'HH:mm'). */
export function wardClock(epochMs: number, timeZone: string): { date: string; time: string } {
  const date = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(epochMs);
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(epochMs);
  return { date, time };
}

/** Sets the strip time fields of the read form. */
export async function setStripTime(page: Page, epochMs: number, timeZone: string): Promise<void> {
  const { date, time } = wardClock(epochMs, timeZone);
  await page.getByLabel('Date', { exact: true }).fill(date);
  await page.getByLabel('Time', { exact: true }).fill(time);
}

/** Signs the read on screen and waits for the bed page's confirmation. */
export async function signRead(page: Page, clinicianName: string): Promise<void> {
  await page.getByRole('button', { name: `Sign read as ${clinicianName}` }).click();
  await page.getByRole('status').filter({ hasText: /^Read saved:/ }).waitFor();
}

/** Saves a full-page screenshot at the viewport size under the e2e output folder; returns its path. */
export async function saveScreenshot(page: Page, name: string, options: { fullPage?: boolean } = {}): Promise<string> {
  mkdirSync(e2eOutputDir, { recursive: true });
  const path = join(e2eOutputDir, `${name}.png`);
  await page.screenshot({ path, fullPage: options.fullPage ?? false });
  return path;
}
