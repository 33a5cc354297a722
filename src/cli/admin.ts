import { ValidationError } from '../core/field-error.ts';
import { createAccount, createUnit } from '../server/accounts/unit-setup.ts';
import { passwordSchema } from '../server/accounts/account-fields.ts';
import { hashPassword } from '../server/auth/password-hash.ts';
import { readSettings } from '../server/settings.ts';
import { describeStorage, openStore } from '../server/storage/open-store.ts';
import type { Role, Store } from '../server/storage/store.ts';
import { roles } from '../server/storage/store.ts';
import type { CliIo } from './cli-io.ts';
import { exitCodes } from './cli-io.ts';

export const adminHelp = `Usage: rhythm-ledger admin <command> [options]

Unit set-up and account maintenance, run on the unit server's machine against its database
(DATA_DIR or DATABASE_URL, or --data-dir / --database-url, exactly as the server reads them).

Commands:
  create --username NAME --name "FULL NAME" --password-stdin [--role ROLE]
         [--unit-name "UNIT"] [--time-zone ZONE] [--unit-id ID]
      Creates an account (role unit-admin unless --role nurse or charge-nurse). On a server
      without a unit, also creates the unit (--unit-name, --time-zone; two 12 h shifts at
      07:00 and 19:00, q4h reads, which a unit admin can change in the app).
  users [--unit-id ID]
      Lists the accounts of the unit.
  set-password --username NAME --password-stdin
      Sets a new password and ends that person's open sessions.
  end-sessions --username NAME
      Ends every open session of that person (a lost tablet, a shared password).

The password is read from stdin (never from the command line, where other users of the machine
could see it): 10 to 200 characters.
`;

interface AdminOptions {
  values: Map<string, string>;
  switches: Set<string>;
  storageArgs: string[];
}

const valueOptions = ['--username', '--name', '--role', '--unit-name', '--time-zone', '--unit-id'];
const switchOptions = ['--password-stdin'];
const storageOptions = ['--data-dir', '--database-url'];

function parseOptions(args: readonly string[]): AdminOptions | string {
  const options: AdminOptions = { values: new Map(), switches: new Set(), storageArgs: [] };
  for (let i = 0; i < args.length; i += 1) {
    const arg = args[i] ?? '';
    const [flag, inline] = arg.includes('=') ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)] : [arg, undefined];
    if (switchOptions.includes(flag)) {
      options.switches.add(flag);
      continue;
    }
    if (!valueOptions.includes(flag) && !storageOptions.includes(flag)) return `unknown option ${flag}`;
    const value = inline ?? args[i + 1];
    if (value === undefined || (inline === undefined && value.startsWith('--'))) return `${flag} needs a value`;
    if (inline === undefined) i += 1;
    if (storageOptions.includes(flag)) options.storageArgs.push(flag, value);
    else options.values.set(flag, value);
  }
  return options;
}

async function readPassword(io: CliIo, options: AdminOptions): Promise<string | ValidationError> {
  if (!options.switches.has('--password-stdin')) return new ValidationError([{ field: 'password', message: 'password: pass --password-stdin and send the password on stdin' }]);
  if (io.stdinIsTerminal) io.writeErr('Type the password, then Enter and Ctrl-D:\n');
  const password = (await io.readStdin()).replace(/\r?\n$/, '');
  const checked = passwordSchema.safeParse(password);
  if (!checked.success) return new ValidationError([{ field: 'password', message: checked.error.issues[0]?.message ?? 'password must be 10 to 200 characters' }]);
  return password;
}

async function unitIdFor(store: Store, options: AdminOptions): Promise<string | ValidationError> {
  const units = await store.listUnits();
  const wanted = options.values.get('--unit-id');
  if (wanted !== undefined) return units.some((u) => u.id === wanted) ? wanted : new ValidationError([{ field: 'unit-id', message: `unit-id: no unit ${wanted} on this server` }]);
  if (units.length === 1 && units[0]) return units[0].id;
  if (units.length === 0) return new ValidationError([{ field: 'unit-id', message: 'unit-id: this server has no unit yet; run admin create with --unit-name and --time-zone' }]);
  return new ValidationError([{ field: 'unit-id', message: `unit-id: this server holds ${units.length} units; name one with --unit-id (${units.map((u) => `${u.id} ${u.name}`).join('; ')})` }]);
}

function required(options: AdminOptions, flag: string): string | ValidationError {
  const value = options.values.get(flag);
  return value !== undefined && value.trim() !== '' ? value : new ValidationError([{ field: flag.slice(2), message: `${flag.slice(2)}: ${flag} is required` }]);
}

async function runCommand(command: string, options: AdminOptions, store: Store, io: CliIo): Promise<number> {
  const nowMs = Date.now();
  if (command === 'create') {
    const username = required(options, '--username');
    const name = required(options, '--name');
    if (username instanceof ValidationError) throw username;
    if (name instanceof ValidationError) throw name;
    const role = (options.values.get('--role') ?? 'unit-admin') as Role;
    if (!roles.includes(role)) throw new ValidationError([{ field: 'role', message: `role must be one of ${roles.join(', ')}` }]);
    const password = await readPassword(io, options);
    if (password instanceof ValidationError) throw password;
    if (await store.findUserByUsername(username)) throw new ValidationError([{ field: 'username', message: `username ${username.toLowerCase()} is already taken; choose another` }]);
    let unitId: string | ValidationError;
    if ((await store.listUnits()).length === 0) {
      const unit = await createUnit(
        store,
        { name: options.values.get('--unit-name') ?? 'Telemetry unit', timeZone: options.values.get('--time-zone') ?? Intl.DateTimeFormat().resolvedOptions().timeZone, idleLockMinutes: 5 },
        nowMs,
      );
      io.writeOut(`Created unit "${unit.name}" (${unit.id}), time zone ${unit.timeZone}.\n`);
      unitId = unit.id;
    } else unitId = await unitIdFor(store, options);
    if (unitId instanceof ValidationError) throw unitId;
    const user = await createAccount(store, { unitId, username, name, role, password }, nowMs);
    io.writeOut(`Created ${user.role} account ${user.username} (${user.id}). Sign in on a tablet, then enroll it from the admin screen.\n`);
    return exitCodes.ok;
  }
  if (command === 'users') {
    const unitId = await unitIdFor(store, options);
    if (unitId instanceof ValidationError) throw unitId;
    for (const u of await store.listUsers(unitId)) io.writeOut(`${u.username}\t${u.role}\t${u.active ? 'active' : 'inactive'}\t${u.name}\n`);
    return exitCodes.ok;
  }
  if (command === 'set-password' || command === 'end-sessions') {
    const username = required(options, '--username');
    if (username instanceof ValidationError) throw username;
    const user = await store.findUserByUsername(username);
    if (!user) throw new ValidationError([{ field: 'username', message: `username: no account ${username.toLowerCase()}` }]);
    if (command === 'set-password') {
      const password = await readPassword(io, options);
      if (password instanceof ValidationError) throw password;
      await store.updateUser(user.id, { passwordHash: await hashPassword(password) });
    }
    const ended = await store.endSessionsOfUser(user.id, nowMs);
    await store.appendAudit({
      unitId: user.unitId,
      kind: command === 'set-password' ? 'user.changed' : 'session.revoked',
      userId: null,
      username: null,
      recordId: user.id,
      deviceId: null,
      clientTimeMs: null,
      serverTimeMs: nowMs,
      detail: `${command === 'set-password' ? 'changed: password; ' : ''}${ended} session(s) ended; from the admin command`,
    });
    io.writeOut(`${command === 'set-password' ? 'Password changed; ' : ''}${ended} open session(s) of ${user.username} ended.\n`);
    return exitCodes.ok;
  }
  io.writeErr(`rhythm-ledger admin: unknown command '${command}'\n\n${adminHelp}`);
  return exitCodes.badInput;
}

/** `rhythm-ledger admin ...`: account and unit set-up against the server's own database. */
export async function runAdmin(args: readonly string[], io: CliIo, env: NodeJS.ProcessEnv = process.env): Promise<number> {
  const [command, ...rest] = args;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    if (command === undefined) io.writeErr(adminHelp);
    else io.writeOut(adminHelp);
    return command === undefined ? exitCodes.badInput : exitCodes.ok;
  }
  const options = parseOptions(rest);
  if (typeof options === 'string') {
    io.writeErr(`rhythm-ledger admin ${command}: ${options}\n\n${adminHelp}`);
    return exitCodes.badInput;
  }
  const settings = readSettings({ DATA_DIR: env.DATA_DIR, DATABASE_URL: env.DATABASE_URL }, options.storageArgs);
  if (!settings.ok) {
    for (const e of settings.errors) io.writeErr(`rhythm-ledger admin: ${e}\n`);
    return exitCodes.badInput;
  }
  const store = await openStore(settings.settings);
  try {
    io.writeErr(`Using the ${describeStorage(settings.settings)}.\n`);
    return await runCommand(command, options, store, io);
  } catch (error) {
    if (error instanceof ValidationError) {
      for (const e of error.errors) io.writeErr(`rhythm-ledger admin ${command}: ${e.message}\n`);
      return exitCodes.badInput;
    }
    throw error;
  } finally {
    await store.close();
  }
}
