import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { runAdmin } from '../../src/cli/admin.ts';
import type { CliIo } from '../../src/cli/cli-io.ts';
import { verifyPassword } from '../../src/server/auth/password-hash.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';

function fakeIo(stdin = ''): CliIo & { out: string; err: string } {
  const io = {
    out: '',
    err: '',
    stdinIsTerminal: false,
    readStdin: async () => stdin,
    readTextFile: async () => '',
    writeOut: (text: string) => {
      io.out += text;
    },
    writeErr: (text: string) => {
      io.err += text;
    },
  };
  return io;
}

describe('rhythm-ledger admin', () => {
  let dataDir: string;
  let env: NodeJS.ProcessEnv;
  beforeEach(() => {
    dataDir = mkdtempSync(join(tmpdir(), 'rl-admin-'));
    env = { DATA_DIR: dataDir };
  });
  afterEach(() => {
    rmSync(dataDir, { recursive: true, force: true });
  });

  const createAdmin = () =>
    runAdmin(['create', '--unit-name', '4 West Telemetry', '--time-zone', 'Europe/Dublin', '--username', 'Admin', '--name', 'A. Admin', '--password-stdin'], fakeIo('a long admin passphrase\n'), env);

  it('creates the unit and its first unit admin on a new server, reading the password from stdin', async () => {
    const io = fakeIo('a long admin passphrase\n');
    const code = await runAdmin(['create', '--unit-name', '4 West Telemetry', '--time-zone', 'Europe/Dublin', '--username', 'Admin', '--name', 'A. Admin', '--password-stdin'], io, env);
    expect(code).toBe(0);
    expect(io.out).toMatch(/^Created unit "4 West Telemetry" \(.+\), time zone Europe\/Dublin\.\nCreated unit-admin account admin/);
    const store = await openSqliteStore(join(dataDir, 'rhythm-ledger.sqlite'));
    const [unit] = await store.listUnits();
    const admin = await store.findUserByUsername('admin');
    expect([unit?.timeZone, unit?.readIntervalHours, unit?.shiftPattern.shifts.map((s) => s.startLocalTime)]).toEqual(['Europe/Dublin', 4, ['07:00', '19:00']]);
    expect([admin?.role, admin?.unitId]).toEqual(['unit-admin', unit?.id]);
    expect(await verifyPassword('a long admin passphrase', admin?.passwordHash ?? '')).toBe(true);
    expect((await store.pullChanges(unit?.id ?? '', 0, 10)).map((c) => c.kind)).toEqual(['unit.put']);
    await store.close();
  });

  it('adds a nurse to the existing unit and lists the accounts', async () => {
    await createAdmin();
    expect(await runAdmin(['create', '--username', 'rnurse', '--name', 'R. Nurse', '--role', 'nurse', '--password-stdin'], fakeIo('a long nurse passphrase'), env)).toBe(0);
    const io = fakeIo();
    expect(await runAdmin(['users'], io, env)).toBe(0);
    expect(io.out).toBe('admin\tunit-admin\tactive\tA. Admin\nrnurse\tnurse\tactive\tR. Nurse\n');
  });

  it('refuses a short password, a bad time zone and a taken username with exit 2, naming each', async () => {
    const short = fakeIo('short');
    expect(await runAdmin(['create', '--username', 'a1', '--name', 'A', '--password-stdin'], short, env)).toBe(2);
    expect(short.err).toContain('password must be 10 to 200 characters');
    const zone = fakeIo('a long admin passphrase');
    expect(await runAdmin(['create', '--username', 'a1', '--name', 'A', '--time-zone', 'Mars/Olympus', '--password-stdin'], zone, env)).toBe(2);
    expect(zone.err).toContain('timeZone must be an IANA time zone such as Europe/Dublin; got Mars/Olympus');
    await createAdmin();
    const taken = fakeIo('a long admin passphrase');
    expect(await runAdmin(['create', '--username', 'ADMIN', '--name', 'B', '--password-stdin'], taken, env)).toBe(2);
    expect(taken.err).toContain('username admin is already taken');
  });

  it('refuses a password on the command line: it must come from stdin', async () => {
    const io = fakeIo();
    expect(await runAdmin(['create', '--username', 'a1', '--name', 'A', '--password', 'visible'], io, env)).toBe(2);
    expect(io.err).toContain('unknown option --password');
  });

  it('sets a new password and ends open sessions', async () => {
    await createAdmin();
    const io = fakeIo('another long passphrase');
    expect(await runAdmin(['set-password', '--username', 'admin', '--password-stdin'], io, env)).toBe(0);
    expect(io.out).toBe('Password changed; 0 open session(s) of admin ended.\n');
    const store = await openSqliteStore(join(dataDir, 'rhythm-ledger.sqlite'));
    expect(await verifyPassword('another long passphrase', (await store.findUserByUsername('admin'))?.passwordHash ?? '')).toBe(true);
    await store.close();
  });

  it('prints help for --help (exit 0) and for no command (exit 2)', async () => {
    const help = fakeIo();
    expect(await runAdmin(['--help'], help, env)).toBe(0);
    expect(help.out).toMatch(/^Usage: rhythm-ledger admin <command>/);
    expect(await runAdmin([], fakeIo(), env)).toBe(2);
  });
});
