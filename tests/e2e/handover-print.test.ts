// The charge nurse's handover at the desk, end to end: three ward tablets push their reads to a real
// unit server through its API; the charge nurse's tablet (a real Chromium with the built app) pulls
// them, shows every bed on the handover desk, a handover is given and received, the unit summary is
// printed to PDF on A4 and US Letter and read back as text, and the shift is downloaded as CSV.
// Invented ward, staff and patients.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { csvColumns } from '../../src/core/csv-export.ts';
import type { Change, ReadCounts, SignedRead, Unit } from '../../src/core/records.ts';
import type { ShiftInstance } from '../../src/core/shifts.ts';
import { previousShift, shiftAt } from '../../src/core/shifts.ts';
import { localDateTimeText } from '../../src/core/zoned-time-text.ts';
import type { Tablet, UnitServer } from './support/e2e-harness.ts';
import { chromiumAvailable, createAccount, e2eOutputDir, ensureAppBuilt, openTablet, startUnitServer } from './support/e2e-harness.ts';

const run = chromiumAvailable();

/** pdftotext and pdftoppm (poppler-utils) read the printed PDF; under CI=true their absence fails the test. */
function popplerAvailable(): boolean {
  const found = spawnSync('pdftotext', ['-v']).status === 0;
  if (!found && process.env.CI === 'true') throw new Error('pdftotext (poppler-utils) is required under CI=true: apt-get install -y poppler-utils');
  if (!found) console.warn('Skipping the handover print test: pdftotext (poppler-utils) not found.');
  return found;
}

const admin = { username: 'admin', name: 'T. Admin', password: 'an invented admin passphrase' };
const ash = { username: 'ash', name: 'A. Ash', password: 'an invented nurse passphrase', role: 'nurse' as const };
const bay = { username: 'bay', name: 'B. Bay', password: 'another invented passphrase', role: 'nurse' as const };
const cole = { username: 'cole', name: 'C. Cole', password: 'a charge nurse passphrase', role: 'charge-nurse' as const };
const pins = { admin: '1357', bay: '8642', cole: '9753' };
const hourMs = 3_600_000;

/** R-R 20 small boxes at 25 mm/s = 800 ms (75 bpm); QT 10 boxes = 400 ms, QTc (Fridericia) 431 ms (Fridericia 1920, arithmetic). */
const quiet: ReadCounts = { paperSpeedMmPerS: 25, gainMmPerMv: 10, rrSmallBoxes: [20, 20], ppSmallBoxes: [], prSmallBoxes: 4, qrsSmallBoxes: 2, qtSmallBoxes: 10, rhythmLabel: 'sinus-rhythm', avBlockNoted: false };
/** QT 13 boxes = 520 ms at R-R 800 ms: QTc (Fridericia) 560 ms, over the 500 ms high-risk limit (Drew et al. 2010, AHA/ACCF statement). */
const longQt: ReadCounts = { ...quiet, qtSmallBoxes: 13 };
/** R-R 28 boxes = 1120 ms: 54 bpm, below the 60 bpm limit (Spodick et al. 1992, classic adult range). */
const slow: ReadCounts = { ...quiet, rrSmallBoxes: [28, 28], rhythmLabel: 'sinus-bradycardia' };

/** One ward tablet of the unit, pushing through the real API with its own enrolment and nurse session. */
async function wardTablet(baseUrl: string, deviceToken: string, account: { username: string; password: string }) {
  const post = async (path: string, body: unknown, headers: Record<string, string> = {}) => {
    const response = await fetch(new URL(path, baseUrl), { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify(body) });
    const text = await response.text();
    if (response.status >= 300) throw new Error(`POST ${path} answered ${response.status}: ${text}`);
    return JSON.parse(text) as Record<string, unknown>;
  };
  const signedIn = (await post('/api/auth/sign-in', { username: account.username, password: account.password, deviceToken })) as { token: string; user: { id: string; name: string } };
  const headers = { authorization: `Bearer ${signedIn.token}`, 'x-device-token': deviceToken };
  return {
    user: signedIn.user,
    async push(changes: Change[]): Promise<void> {
      const answer = (await post('/api/sync/push', { changes }, headers)) as { results: Array<{ status: string; reason?: string }> };
      const refused = answer.results.filter((r) => r.status !== 'accepted');
      if (refused.length > 0) throw new Error(`push refused: ${JSON.stringify(refused)}`);
    },
  };
}

// Tablet steps, driven by accessible names as a nurse would.

/** A new tablet's first visit: the unit admin signs in, enrols it and picks a PIN; ends on the lock screen. */
async function joinWardAsAdmin(page: Page, url: string, account: { username: string; password: string }, tabletLabel: string, pin: string): Promise<void> {
  await page.goto(url);
  // The service worker takes control first, so nothing reloads the page under the form.
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 });
  const join = page.locator('section.choice').filter({ has: page.getByRole('heading', { name: 'Join a ward on the unit server' }) });
  await join.getByLabel('Username').fill(account.username);
  await join.getByLabel('Password').fill(account.password);
  await join.getByRole('button', { name: 'Sign in' }).click();
  await join.getByLabel('Tablet name').fill(tabletLabel);
  await join.getByRole('button', { name: 'Enrol tablet' }).click();
  await join.getByLabel('PIN', { exact: true }).fill(pin);
  await join.getByLabel('PIN again').fill(pin);
  await join.getByRole('button', { name: 'Save PIN' }).click();
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor({ timeout: 30_000 });
}

/** Picks the clinician on the lock screen and types the PIN; ends behind the lock. */
async function unlockAs(page: Page, name: string, pin: string): Promise<void> {
  await page.getByRole('heading', { name: 'Who is charting?' }).waitFor();
  await page.getByRole('button', { name, exact: true }).click();
  await page.getByLabel(`PIN for ${name}`).fill(pin);
  await page.getByRole('button', { name: 'Unlock' }).click();
  await page.getByRole('button', { name: 'Lock screen' }).waitFor();
}

async function openRoute(page: Page, hash: string): Promise<void> {
  await page.evaluate((h) => {
    location.hash = h;
  }, hash);
}

/** Another clinician signs in to the unit server on this tablet from Unit settings and picks a PIN. */
async function connectAccount(page: Page, account: { username: string; password: string; name: string }, pin: string): Promise<void> {
  // Opening the settings screen afresh starts with its sign-in panel closed.
  await openRoute(page, '#/beds');
  await openRoute(page, '#/settings');
  await page.getByText('Connect this tablet to the unit server').click();
  const form = page.locator('form.server-sign-in');
  await form.getByLabel('Username').fill(account.username);
  await form.getByLabel('Password').fill(account.password);
  await form.getByRole('button', { name: 'Sign in' }).click();
  await form.getByLabel('PIN', { exact: true }).fill(pin);
  await form.getByLabel('PIN again').fill(pin);
  await form.getByRole('button', { name: 'Save PIN' }).click();
  await page.getByText(`Signed in as ${account.name}. This tablet now syncs with the unit server.`).waitFor();
}

const syncLine = (page: Page) => page.locator('.sync-status__text').textContent();

async function snapshot(page: Page, name: string, fullPage = false): Promise<void> {
  const path = join(e2eOutputDir, `${name}.png`);
  mkdirSync(dirname(path), { recursive: true });
  await page.screenshot({ path, fullPage });
}

/** The unit server's API as the unit admin on an enrolled desk tablet: the change log and the audit trail. */
async function adminApi(baseUrl: string, account: { username: string; password: string }) {
  const call = async (path: string, init: { method?: string; body?: unknown; headers?: Record<string, string> } = {}) => {
    const response = await fetch(new URL(path, baseUrl), {
      method: init.method ?? 'GET',
      headers: { accept: 'application/json', ...(init.body === undefined ? {} : { 'content-type': 'application/json' }), ...init.headers },
      ...(init.body === undefined ? {} : { body: JSON.stringify(init.body) }),
    });
    const text = await response.text();
    if (response.status >= 300) throw new Error(`${init.method ?? 'GET'} ${path} answered ${response.status}: ${text}`);
    return JSON.parse(text) as unknown;
  };
  const signedIn = (await call('/api/auth/sign-in', { method: 'POST', body: account })) as { token: string };
  const enrolled = (await call('/api/devices/enroll', { method: 'POST', body: { label: 'Audit desk' }, headers: { authorization: `Bearer ${signedIn.token}` } })) as { deviceToken: string };
  const headers = { authorization: `Bearer ${signedIn.token}`, 'x-device-token': enrolled.deviceToken };
  return {
    async changes(): Promise<Array<{ kind: string; record: unknown }>> {
      return ((await call('/api/sync/pull?after=0&limit=500', { headers })) as { changes: Array<{ kind: string; record: unknown }> }).changes;
    },
    async audit(query: string): Promise<Array<{ kind: string; username: string | null }>> {
      return ((await call(`/api/audit${query}`, { headers })) as { events: Array<{ kind: string; username: string | null }> }).events;
    },
  };
}

let changeCount = 0;
const change = <K extends Change['kind']>(kind: K, record: Extract<Change, { kind: K }>['record'], atMs: number): Change =>
  ({ changeId: `e2e-change-${String((changeCount += 1)).padStart(4, '0')}`, kind, deviceTimeMs: atMs, record }) as Change;

describe.runIf(run && popplerAvailable())('handover at the desk, printed and exported', () => {
  let server: UnitServer;
  let tablet: Tablet;
  let page: Page;
  let api: Awaited<ReturnType<typeof adminApi>>;
  let unit: Unit;
  let shift: ShiftInstance;
  const out = join(e2eOutputDir, 'handover');

  beforeAll(async () => {
    ensureAppBuilt();
    mkdirSync(out, { recursive: true });
    server = await startUnitServer({ admin });
    for (const account of [ash, bay, cole]) createAccount(server.dataDir, account);
    api = await adminApi(server.url, { username: admin.username, password: admin.password });
    unit = (await api.changes()).find((c) => c.kind === 'unit.put')!.record as Unit;
    // The shift that has just ended is fully in the past whatever the clock says now.
    const nowMs = Date.now();
    shift = previousShift(shiftAt(nowMs, unit.shiftPattern, unit.timeZone), unit.shiftPattern, unit.timeZone);

    // Three ward tablets, enrolled by the unit admin; the admin sets up beds and stays on the first.
    const adminSession = await fetch(new URL('/api/auth/sign-in', server.url), { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: admin.username, password: admin.password }) }).then((r) => r.json() as Promise<{ token: string }>);
    const tokens: string[] = [];
    for (const label of ['Tablet one, bay 1', 'Tablet two, bay 2', 'Tablet three, bay 3']) {
      const enrolled = await fetch(new URL('/api/devices/enroll', server.url), { method: 'POST', headers: { 'content-type': 'application/json', authorization: `Bearer ${adminSession.token}` }, body: JSON.stringify({ label }) }).then((r) => r.json() as Promise<{ deviceToken: string }>);
      tokens.push(enrolled.deviceToken);
    }
    const setUp = await wardTablet(server.url, tokens[0]!, admin);
    const startMs = shift.startMs - 6 * hourMs;
    const beds = [1, 2, 3].map((n) => ({ id: `bed-e2e-000${n}`, unitId: unit.id, label: `Bed ${n}`, sortOrder: n, active: true }));
    const stays = [
      ['K.L.', 'male'],
      ['M.N.', 'female'],
      ['O.P.', 'male'],
    ].map(([alias, sex], i) => ({
      id: `stay-e2e-000${i + 1}`,
      unitId: unit.id,
      bedId: beds[i]!.id,
      alias: alias!,
      sex: sex as 'male' | 'female',
      paced: false,
      bundleBranchBlock: false,
      qtProlongingDrugs: '',
      notes: '',
      startMs,
      endMs: null,
      updatedAtMs: startMs,
      updatedBy: admin.name,
    }));
    await setUp.push([...beds.map((b) => change('bed.put', b, startMs)), ...stays.map((s) => change('stay.put', s, startMs))]);

    // Each nurse charts one bed on her own tablet: reads at 1 h, 5 h and 9 h into the shift.
    const nurses = [
      { account: ash, token: tokens[0]!, counts: quiet },
      { account: bay, token: tokens[1]!, counts: longQt },
      { account: cole, token: tokens[2]!, counts: slow },
    ];
    for (const [i, nurse] of nurses.entries()) {
      const device = await wardTablet(server.url, nurse.token, nurse.account);
      const reads: SignedRead[] = [1, 5, 9].map((h) => {
        const stripTimeMs = shift.startMs + h * hourMs;
        return {
          id: `read-e2e-${i + 1}-${h}`,
          unitId: unit.id,
          bedId: beds[i]!.id,
          stayId: stays[i]!.id,
          stripTimeMs,
          enteredAtMs: stripTimeMs + 60_000,
          signedAtMs: stripTimeMs + 120_000,
          authorId: device.user.id,
          authorName: device.user.name,
          deviceId: `tablet-${i + 1}`,
          reason: 'routine',
          counts: nurse.counts,
        };
      });
      await device.push(reads.map((r) => change('read.sign', r, r.signedAtMs)));
    }

    tablet = await openTablet({ width: 1280, height: 900 });
    page = await tablet.context.newPage();
  });
  afterEach(async ({ task }) => {
    if (task.result?.state === 'fail' && page) await snapshot(page, `failed-handover-${task.name.slice(0, 40).replace(/\W+/g, '-')}`, true).catch(() => undefined);
  });
  afterAll(async () => {
    await tablet?.close();
    await server?.stop();
  });

  it('shows the charge nurse every bed from the three tablets, urgent first, with where the data came from', async () => {
    await joinWardAsAdmin(page, server.url, admin, 'Charge desk tablet', pins.admin);
    await unlockAs(page, admin.name, pins.admin);
    await connectAccount(page, bay, pins.bay);
    await connectAccount(page, cole, pins.cole);
    await page.getByRole('button', { name: 'Lock screen' }).click();
    await unlockAs(page, cole.name, pins.cole);
    await expect.poll(() => syncLine(page), { timeout: 20_000 }).toMatch(/last synced \d\d:\d\d$/);
    await page.getByRole('link', { name: 'Handover desk' }).click();
    await page.getByRole('link', { name: /^Previous shift/ }).click();
    await page.getByText(new RegExp(`^${shift.name} shift, `)).first().waitFor();
    await expect.poll(() => page.locator('.desk-card h2').allTextContents(), { timeout: 20_000 }).toEqual(['Bed 2 M.N.', 'Bed 3 O.P.', 'Bed 1 K.L.']);
    expect(await page.locator('.data-source').textContent()).toMatch(/^Data from the unit server, last synced \d\d:\d\d$/);
    expect(await page.locator('.desk-card').first().getByLabel('Open flags').textContent()).toBe('1 URGENT');
    await snapshot(page, 'handover/desk', true);
  });

  it('gives bed 1\'s handover as the charge nurse and has it received by another nurse, and the server records both', async () => {
    await page.getByRole('link', { name: 'Bed 1, K.L.: open the handover' }).click();
    await page.getByLabel(/Your own words for the receiving nurse/).fill('Family visiting in the morning.');
    await page.getByRole('button', { name: `Hand over as ${cole.name}` }).click();
    await page.getByRole('button', { name: bay.name, exact: true }).click();
    await page.getByLabel(`PIN for ${bay.name}`).fill(pins.bay);
    await page.getByRole('button', { name: `Confirm received by ${bay.name}` }).click();
    await page.locator('.hs-chip').filter({ hasText: `Receivedby ${bay.name}` }).waitFor();
    await snapshot(page, 'handover/bed-1-received', true);
    await expect.poll(async () => (await api.audit('?kind=handover.received')).map((e) => e.username), { timeout: 20_000 }).toEqual([bay.username]);
    expect((await api.audit('?kind=handover.given')).map((e) => e.username)).toEqual([cole.username]);
  });

  it('prints the unit summary to PDF on A4 and US Letter, one bed per page run, with every heading, figure, source and caution', async () => {
    await openRoute(page, `#/handover?shift=${encodeURIComponent(shift.key)}`);
    await page.getByRole('link', { name: 'Print unit summary' }).click();
    await page.getByRole('button', { name: 'Print' }).waitFor();
    await page.emulateMedia({ media: 'print' });
    for (const format of ['A4', 'Letter'] as const) {
      const pdfPath = join(out, `unit-summary-${format.toLowerCase()}.pdf`);
      writeFileSync(pdfPath, await page.pdf({ format }));
      const info = spawnSync('pdfinfo', [pdfPath], { encoding: 'utf8' }).stdout;
      const pages = Number(/Pages:\s+(\d+)/.exec(info)?.[1]);
      expect(info).toMatch(format === 'A4' ? /Page size:\s+595\.\d+ x 842\.\d+ pts \(A4\)/ : /Page size:\s+612 x 792 pts \(letter\)/);
      // An overview page, then each of the three beds starting on its own page.
      expect(pages).toBeGreaterThanOrEqual(1 + 3);
      const pageTexts = Array.from({ length: pages }, (_, i) => spawnSync('pdftotext', ['-layout', '-f', String(i + 1), '-l', String(i + 1), pdfPath, '-'], { encoding: 'utf8' }).stdout);
      const shiftLine = `${shift.name} shift ${localDateTimeText(shift.startMs, unit.timeZone)} to ${localDateTimeText(shift.endMs, unit.timeZone)}`;
      for (const text of pageTexts) {
        expect(text).toContain(`Unit: ${unit.name}`);
        expect(text).toContain(shiftLine);
        expect(text).toMatch(new RegExp(`Printed by ${cole.name} at \\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d`));
        expect(text.replace(/\s+/g, ' ')).toContain('Decision support only: every figure is arithmetic on the box counts entered.');
      }
      // Each bed begins a page whose header names the bed and the patient alias.
      for (const [bed, alias] of [['Bed 1', 'K.L.'], ['Bed 2', 'M.N.'], ['Bed 3', 'O.P.']] as const) {
        expect(pageTexts.some((t) => new RegExp(`${bed}\\s+Patient: ${alias.replace(/\./g, '\\.')}`).test(t))).toBe(true);
      }
      const all = pageTexts.join('\n');
      const flat = all.replace(/\s+/g, ' ');
      // The reads table's header names each figure with its unit (one line, or wrapped onto two).
      expect(flat).toMatch(/Strip time By (Rate \(bpm\) PR \(ms\) QRS \(ms\) QT \(ms\) QTc \(ms\), Fridericia|Rate PR QRS QT QTc \(ms\), \(bpm\) \(ms\) \(ms\) \(ms\) Fridericia)/);
      // Bed 2's reads: 75 bpm, PR 160 ms, QRS 80 ms, QT 520 ms, QTc 560 ms (see the counts above).
      expect(all).toMatch(/B\.( Bay)?\s+75\s+160\s+80\s+520\s+560/);
      expect(flat).toContain('High-risk QTc 560 ms (limit ≥ 500 ms)');
      expect(flat).toContain('Source: QTc of 500 ms or more: high torsade risk (Drew et al. 2010 AHA/ACCF statement');
      expect(flat).toContain(`Received. Given by ${cole.name}`);
      expect(flat).toContain(`received by ${bay.name}`);
      expect(flat).not.toContain('Lock screen');
      expect(flat).not.toContain('Unit settings');
      const pngPrefix = join(out, `unit-summary-${format.toLowerCase()}`);
      expect(spawnSync('pdftoppm', ['-png', '-r', '60', pdfPath, pngPrefix]).status).toBe(0);
    }
    await page.emulateMedia({ media: 'screen' });
  });

  it('downloads the shift as CSV with the documented header and one row per read, and audits it on the server', async () => {
    await openRoute(page, `#/handover?shift=${encodeURIComponent(shift.key)}`);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download CSV' }).click()]);
    const path = join(out, download.suggestedFilename());
    await download.saveAs(path);
    const lines = readFileSync(path, 'utf8').trimEnd().split('\r\n');
    expect(lines[0]).toBe(csvColumns.map((c) => c.name).join(','));
    expect(lines).toHaveLength(1 + 9);
    expect(download.suggestedFilename()).toBe(`ward-5-south-test_shift-${shift.startLocalDate}-${shift.name.toLowerCase()}.csv`);
    await page.getByText(/^Downloaded .* \(9 reads\)\. Recorded in the unit's audit trail\.$/).waitFor();
    const exports = await api.audit('?kind=export');
    expect(exports.map((e) => e.username)).toContain(cole.username);
  });
});
