// Builds the tablet app when the build is missing or older than its sources, then starts the unit server
// (arguments are passed on: `npm start -- --port 9000`), passing SIGINT and SIGTERM on so it stops cleanly.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

function newestMtime(path) {
  const s = statSync(path);
  if (!s.isDirectory()) return s.mtimeMs;
  return Math.max(s.mtimeMs, ...readdirSync(path).map((name) => newestMtime(join(path, name))));
}
const buildStamp = 'dist/index.html';
const sources = ['src/app', 'src/core', 'src/store', 'src/sync', 'src/sw', 'public', 'index.html', 'vite.config.ts'];
const stale = !existsSync(buildStamp) || sources.some((p) => existsSync(p) && newestMtime(p) > statSync(buildStamp).mtimeMs);
if (stale) {
  console.log('Building the tablet app...');
  const build = spawnSync(process.execPath, ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], { stdio: 'inherit' });
  if (build.status !== 0) process.exit(build.status ?? 1);
}
const server = spawn(process.execPath, ['--import', 'tsx', 'src/server/main.ts', ...process.argv.slice(2)], { stdio: 'inherit' });
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal));
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
