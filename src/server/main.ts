// Entry point: reads settings from the environment and flags, starts the unit server, stops it cleanly on SIGINT/SIGTERM.
import { createServerLog } from './server-log.ts';
import { readSettings, settingDefinitions } from './settings.ts';
import { startServer } from './start-server.ts';

const argv = process.argv.slice(2);
if (argv.includes('--help')) {
  console.log('Rhythm Ledger unit server. Settings (environment variable / flag, default):');
  for (const d of settingDefinitions) console.log(`  ${d.env} / ${d.flag}  (default ${d.defaultText})\n      ${d.description}`);
  process.exit(0);
}
const parsed = readSettings(process.env, argv);
if (!parsed.ok) {
  for (const error of parsed.errors) console.error(`Cannot start: ${error}`);
  process.exit(2);
}
const log = createServerLog(parsed.settings.logLevel);
try {
  const server = await startServer(parsed.settings, log);
  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info(`${signal}: finishing requests in flight, then stopping`);
    server.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
} catch (error) {
  const code = (error as { code?: string }).code;
  console.error(`Cannot start: ${code === 'EADDRINUSE' ? `port ${parsed.settings.port} is already in use; set PORT to another` : error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}
