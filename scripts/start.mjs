// Builds the tablet app when the build is missing or older than its sources, then starts the unit server
// (arguments are passed on: `npm start -- --port 9000`), passing SIGINT and SIGTERM on so it stops cleanly.
import { spawn } from 'node:child_process';
import { buildIfStale } from './build-if-stale.mjs';

const status = buildIfStale();
if (status !== 0) process.exit(status);
const server = spawn(process.execPath, ['--import', 'tsx', 'src/server/main.ts', ...process.argv.slice(2)], { stdio: 'inherit' });
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal));
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
