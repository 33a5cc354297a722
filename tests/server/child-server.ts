import type { ChildProcess } from 'node:child_process';
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { createAccount, createUnit } from '../../src/server/accounts/unit-setup.ts';
import { tokenHash } from '../../src/server/auth/opaque-token.ts';
import type { Store, UserRecord } from '../../src/server/storage/store.ts';
import type { Unit } from '../../src/core/records.ts';
import type { ChangeResult } from '../../src/server/sync/change-result.ts';
import type { PulledItem } from './sync-helpers.ts';
import { testPassword, testPasswordLogN } from './test-app.ts';

/** A real server process (node --import tsx src/server/main.ts), for tests that kill it. */
export interface ChildServer {
  url: string;
  process: ChildProcess;
  /** Resolves when the process has exited. */
  exited: Promise<number | null>;
  kill(signal?: NodeJS.Signals): Promise<void>;
}

export async function startChildServer(env: Record<string, string>): Promise<ChildServer> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/server/main.ts'], {
    env: { ...process.env, PORT: '0', HOST: '127.0.0.1', LOG_LEVEL: 'warn', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const exited = new Promise<number | null>((resolvePromise) => child.once('exit', (code) => resolvePromise(code)));
  let output = '';
  const url = await new Promise<string>((resolvePromise, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start in 30 s:\n${output}`)), 30_000);
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      const match = /running at (http:\/\/127\.0\.0\.1:\d+\/)/.exec(output);
      if (match?.[1]) {
        clearTimeout(timer);
        resolvePromise(match[1].replace(/\/$/, ''));
      }
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', onData);
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`server exited with ${code} before starting:\n${output}`));
    });
  });
  return {
    url,
    process: child,
    exited,
    async kill(signal = 'SIGKILL') {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
}

/** A unit, its admin and one enrolled tablet written straight into a store, before any server runs. */
export interface SeededUnit {
  unit: Unit;
  admin: UserRecord;
  deviceToken: string;
}

export async function seedUnit(store: Store, nowMs = Date.now()): Promise<SeededUnit> {
  const unit = await createUnit(store, { name: '4 West Telemetry', timeZone: 'Europe/Dublin', idleLockMinutes: 5 }, nowMs);
  const admin = await createAccount(store, { unitId: unit.id, username: `admin-${randomUUID().slice(0, 6)}`, name: 'A. Admin', role: 'unit-admin', password: testPassword }, nowMs, testPasswordLogN);
  const deviceToken = `device-${randomUUID()}`;
  const deviceId = randomUUID();
  await store.createDevice({ id: deviceId, unitId: unit.id, label: 'Tablet A', tokenHash: tokenHash(deviceToken), enrolledBy: admin.id, enrolledAtMs: nowMs, revokedAtMs: null });
  await store.noteDeviceUser(deviceId, admin.id, nowMs);
  return { unit, admin, deviceToken };
}

/** A tablet talking to a real server over HTTP. */
export class HttpTablet {
  constructor(
    public baseUrl: string,
    private readonly deviceToken: string,
    public token = '',
  ) {}

  async signIn(username: string): Promise<void> {
    const answer = await fetch(`${this.baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username, password: testPassword, deviceToken: this.deviceToken }) });
    if (answer.status !== 200) throw new Error(`sign-in answered ${answer.status}`);
    this.token = ((await answer.json()) as { token: string }).token;
  }

  private headers() {
    return { 'content-type': 'application/json', authorization: `Bearer ${this.token}`, 'x-device-token': this.deviceToken };
  }

  async push(changes: unknown[]): Promise<ChangeResult[]> {
    const answer = await fetch(`${this.baseUrl}/api/sync/push`, { method: 'POST', headers: this.headers(), body: JSON.stringify({ changes }) });
    if (answer.status !== 200) throw new Error(`push answered ${answer.status}: ${await answer.text()}`);
    return ((await answer.json()) as { results: ChangeResult[] }).results;
  }

  async pullPage(after: string, limit = 500): Promise<{ changes: PulledItem[]; cursor: string; hasMore: boolean }> {
    const answer = await fetch(`${this.baseUrl}/api/sync/pull?after=${after}&limit=${limit}`, { headers: this.headers() });
    if (answer.status !== 200) throw new Error(`pull answered ${answer.status}`);
    return (await answer.json()) as { changes: PulledItem[]; cursor: string; hasMore: boolean };
  }

  async pullAll(after = '0'): Promise<PulledItem[]> {
    const all: PulledItem[] = [];
    let cursor = after;
    for (;;) {
      const page = await this.pullPage(cursor);
      all.push(...page.changes);
      cursor = page.cursor;
      if (!page.hasMore) return all;
    }
  }
}
