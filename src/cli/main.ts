import { existsSync } from 'node:fs';
import { coreVersion } from '../core/core-version.ts';
import { analyzeHelp, runAnalyze } from './analyze-command.ts';
import type { CliIo } from './cli-io.ts';
import { exitCodes } from './cli-io.ts';
import { runVerify, verifyHelp } from './verify-command.ts';

export { nodeCliIo } from './cli-io.ts';

/** The admin commands live in ./admin.ts, written for the unit server; it exports this function when present. */
export interface AdminModule {
  runAdmin(args: readonly string[], io: CliIo): Promise<number>;
}

const adminModuleUrl = new URL('./admin.ts', import.meta.url);

async function runAdmin(args: readonly string[], io: CliIo): Promise<number> {
  if (!existsSync(adminModuleUrl)) {
    io.writeErr('rhythm-ledger admin: the admin commands are not installed in this copy (src/cli/admin.ts is missing).\n');
    return exitCodes.badInput;
  }
  const adminModule = (await import(adminModuleUrl.href)) as Partial<AdminModule>;
  if (typeof adminModule.runAdmin !== 'function') throw new Error('src/cli/admin.ts does not export runAdmin(args, io)');
  return adminModule.runAdmin(args, io);
}

interface Command {
  summary: string;
  help: () => string;
  run: (args: readonly string[], io: CliIo) => Promise<number>;
}

const commands: Record<string, Command> = {
  analyze: { summary: 'analyse one read given as JSON on stdin; print every figure, flag and question as JSON', help: () => analyzeHelp, run: runAnalyze },
  verify: { summary: "check the program's arithmetic against your unit's worked examples (CSV)", help: () => verifyHelp, run: runVerify },
  admin: {
    summary: 'unit set-up and maintenance on the server',
    help: () => 'Usage: rhythm-ledger admin --help (lists the admin commands when they are installed)\n',
    run: runAdmin,
  },
};

/** Help for the whole command. */
export function mainHelp(): string {
  const adminNote = existsSync(adminModuleUrl) ? '' : ' (not installed in this copy)';
  const lines = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(8)} ${c.summary}${name === 'admin' ? adminNote : ''}`);
  return `Usage: rhythm-ledger <command> [options]

The Rhythm Ledger validation kit: runs the same computation core as the ward app and the
unit server, so a unit can check the arithmetic against its own worked examples.

Commands:
${lines.join('\n')}

  rhythm-ledger <command> --help   help for one command
  rhythm-ledger --version          the computation core's version

Decision support only: verify on the monitor; your unit's protocol and your licensed
practice govern. Limits are configurable defaults.
`;
}

/** Runs one invocation and returns its exit code; never throws (a fault in the program exits 3). */
export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  try {
    if (name === undefined) {
      io.writeErr(mainHelp());
      return exitCodes.badInput;
    }
    if (name === '--help' || name === '-h' || name === 'help') {
      const topic = name === 'help' ? rest[0] : undefined;
      const command = topic === undefined ? undefined : commands[topic];
      if (command && topic !== 'admin') io.writeOut(command.help());
      else if (topic === 'admin') return await runAdmin(['--help'], io);
      else io.writeOut(mainHelp());
      return exitCodes.ok;
    }
    if (name === '--version') {
      io.writeOut(`rhythm-ledger core ${coreVersion}\n`);
      return exitCodes.ok;
    }
    const command = Object.hasOwn(commands, name) ? commands[name] : undefined;
    if (command === undefined) {
      io.writeErr(`rhythm-ledger: unknown command '${name}'\n\n${mainHelp()}`);
      return exitCodes.badInput;
    }
    return await command.run(rest, io);
  } catch (error) {
    io.writeErr(`rhythm-ledger: unexpected fault in the program (not in your input): ${(error as Error).message}\n`);
    return exitCodes.internalError;
  }
}
