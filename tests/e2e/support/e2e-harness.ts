// Shared harness for browser tests: build the app once, start real unit servers on free ports with
// throwaway data folders, and open headless Chromium tablets with their own profiles.
import { spawn, spawnSync } from 'node:child_process';
import type { ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BrowserContext } from 'playwright-core';
import { chromium } from 'playwright-core';
// @ts-expect-error plain ES module script without type declarations
import { buildIfStale } from '../../../scripts/build-if-stale.mjs';

export const chromiumPath = '/usr/bin/chromium';

/**
 * Whether browser tests can run here. Missing Chromium skips them on a developer machine and fails
 * them under CI=true, where .ci/run installs it.
 */
export function chromiumAvailable(): boolean {
  if (existsSync(chromiumPath)) return true;
  if (process.env.CI === 'true') throw new Error(`Chromium is required under CI=true but ${chromiumPath} is missing (apt-get install -y chromium)`);
  console.warn(`Skipping browser tests: ${chromiumPath} not found.`);
  return false;
}

/** Builds dist/ if any source changed since the last build. */
export function ensureAppBuilt(): void {
  const status = (buildIfStale as (log: (line: string) => void) => number)(() => undefined);
  if (status !== 0) throw new Error(`vite build failed with status ${status}`);
}

export interface UnitServer {
  url: string;
  dataDir: string;
  stop(): Promise<void>;
}

export interface AdminAccount {
  username: string;
  name: string;
  password: string;
  unitName?: string;
  timeZone?: string;
}

/** Runs `rhythm-ledger admin create` against a data folder (creates the unit on a new server). */
export function createAccount(dataDir: string, account: AdminAccount & { role?: 'nurse' | 'charge-nurse' | 'unit-admin' }): void {
  const args = ['bin/rhythm-ledger.mjs', 'admin', 'create', '--data-dir', dataDir, '--username', account.username, '--name', account.name, '--password-stdin'];
  if (account.role) args.push('--role', account.role);
  if (account.unitName) args.push('--unit-name', account.unitName);
  if (account.timeZone) args.push('--time-zone', account.timeZone);
  const result = spawnSync(process.execPath, args, { input: `${account.password}\n`, encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`admin create failed (${result.status}): ${result.stderr}${result.stdout}`);
}

/** Starts a real unit server process (SQLite in a fresh data folder) on a free loopback port. */
export async function startUnitServer(options: { admin?: AdminAccount; env?: Record<string, string> } = {}): Promise<UnitServer> {
  const dataDir = mkdtempSync(join(tmpdir(), 'rl-e2e-data-'));
  if (options.admin) createAccount(dataDir, { unitName: 'Ward 5 South (test)', timeZone: 'Europe/Berlin', ...options.admin });
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'src/server/main.ts'], {
    env: { ...process.env, PORT: '0', HOST: '127.0.0.1', DATA_DIR: dataDir, LOG_LEVEL: 'warn', ...options.env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`unit server did not start in 30 s:\n${output}`)), 30_000);
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      const match = /running at (http:\/\/[^\s]+\/)/.exec(output);
      if (match?.[1]) {
        clearTimeout(timer);
        resolve(match[1]);
      }
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', onData);
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`unit server exited with ${code}:\n${output}`));
    });
  });
  return {
    url,
    dataDir,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
        child.kill('SIGTERM');
        await Promise.race([exited, new Promise((r) => setTimeout(r, 5_000))]);
        if (child.exitCode === null) child.kill('SIGKILL');
      }
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export interface Tablet {
  context: BrowserContext;
  close(): Promise<void>;
}

/**
 * A headless Chromium "tablet" with its own persistent profile (so the service worker and IndexedDB behave as installed).
 * `device` sets the tablet's language (navigator.language) and clock zone.
 */
export async function openTablet(viewport = { width: 1280, height: 800 }, device: { locale?: string; timezoneId?: string } = {}): Promise<Tablet> {
  const profileDir = mkdtempSync(join(tmpdir(), 'rl-e2e-profile-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: chromiumPath,
    headless: true,
    viewport,
    ...device,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/** Where browser tests save screenshots and PDFs for people to look at (git-ignored). */
export const e2eOutputDir = join('test-output', 'e2e');
