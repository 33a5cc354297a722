// Builds the tablet app (Vite) when dist/ is missing or older than any of its sources.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

const buildStamp = 'dist/index.html';
const sources = ['src/app', 'src/core', 'src/store', 'src/sync', 'src/sw', 'public', 'index.html', 'vite.config.ts', 'package-lock.json'];

function newestMtime(path) {
  const s = statSync(path);
  if (!s.isDirectory()) return s.mtimeMs;
  return Math.max(s.mtimeMs, ...readdirSync(path).map((name) => newestMtime(join(path, name))));
}

/** True when the build is missing or a source changed after it. */
export function appBuildIsStale() {
  if (!existsSync(buildStamp)) return true;
  const builtAt = statSync(buildStamp).mtimeMs;
  return sources.some((p) => existsSync(p) && newestMtime(p) > builtAt);
}

/** Runs `vite build` when stale; returns the exit status (0 when nothing needed doing). */
export function buildIfStale(log = console.log) {
  if (!appBuildIsStale()) return 0;
  log('Building the tablet app...');
  // NODE_ENV is forced: under Vitest it is 'test', and Vite would then emit a development build
  // (import.meta.env.DEV true), which never registers the service worker.
  const env = { ...process.env, NODE_ENV: 'production' };
  const build = spawnSync(process.execPath, ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], { stdio: 'inherit', env });
  return build.status ?? 1;
}
