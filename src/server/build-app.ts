import type { FastifyInstance } from 'fastify';
import Fastify from 'fastify';
import { installErrorAnswer } from './answer-error.ts';
import type { Access } from './auth/access-guard.ts';
import { installAccessGuard } from './auth/access-guard.ts';
import { registerAuditRoutes } from './routes/audit-routes.ts';
import { registerAuthRoutes } from './routes/auth-routes.ts';
import { registerDeviceRoutes } from './routes/device-routes.ts';
import { registerExportRoutes } from './routes/export-routes.ts';
import { registerHealthRoutes } from './routes/health-routes.ts';
import { registerSyncRoutes } from './routes/sync-routes.ts';
import { registerUserRoutes } from './routes/user-routes.ts';
import { installSecurityHeaders } from './security-headers.ts';
import { serveTabletApp } from './serve-tablet-app.ts';
import type { ServerLog } from './server-log.ts';
import { createServerLog } from './server-log.ts';
import type { ServerSettings } from './settings.ts';
import { defaultSettings } from './settings.ts';
import type { Role, Store } from './storage/store.ts';

/** Request bodies above this are refused (413): a full push of 200 reads is well under it. */
export const bodyLimitBytes = 1024 * 1024;

/** One registered API route and who may call it (the route-enumeration test walks these). */
export interface ApiRoute {
  method: string;
  url: string;
  access: Access;
  roles: readonly Role[] | null;
}

declare module 'fastify' {
  interface FastifyInstance {
    apiRoutes: ApiRoute[];
  }
}

export interface AppOptions {
  store: Store;
  settings?: Partial<ServerSettings>;
  /** The server clock; tests move it to expire sessions and rate limits. */
  nowMs?: () => number;
  log?: ServerLog;
  /** scrypt cost as log2(N) for new password hashes; lowered only by tests. */
  passwordLogN?: number;
}

/** Builds the whole server (API and tablet app) without listening: tests call it and inject requests. */
export async function buildApp(options: AppOptions): Promise<FastifyInstance> {
  const settings: ServerSettings = { ...defaultSettings, ...options.settings };
  const nowMs = options.nowMs ?? Date.now;
  const log = options.log ?? createServerLog(settings.logLevel);
  const { store } = options;

  // Fastify's own logger stays off: it would print URLs and errors that may quote data.
  const app = Fastify({ logger: false, bodyLimit: bodyLimitBytes, trustProxy: settings.trustProxy });
  // JSON only: a text body is refused with 415 rather than reaching a route as a string.
  app.removeContentTypeParser('text/plain');
  const apiRoutes: ApiRoute[] = [];
  app.decorate('apiRoutes', apiRoutes);
  app.addHook('onRoute', (route) => {
    if (!route.url.startsWith('/api/')) return;
    for (const method of [route.method].flat()) {
      if (method === 'HEAD') continue;
      apiRoutes.push({ method, url: route.url, access: route.config?.access ?? 'device', roles: route.config?.roles ?? null });
    }
  });
  app.addHook('onResponse', async (request, reply) => {
    log.info(`${request.method} ${request.routeOptions.url ?? 'unmatched'} ${reply.statusCode} ${reply.elapsedTime.toFixed(1)} ms`);
  });

  installErrorAnswer(app, log);
  installSecurityHeaders(app);
  installAccessGuard(app, store, { idleMs: settings.sessionIdleMinutes * 60_000, nowMs });

  registerHealthRoutes(app, { storage: store.kind });
  registerAuthRoutes(app, {
    store,
    nowMs,
    sessionMaxMs: settings.sessionMaxHours * 3_600_000,
    signInLimit: { maxFailures: settings.signInMaxFailures, windowMs: settings.signInWindowMinutes * 60_000 },
  });
  registerDeviceRoutes(app, { store, nowMs });
  const userOptions: { store: Store; nowMs: () => number; passwordLogN?: number } = { store, nowMs };
  if (options.passwordLogN !== undefined) userOptions.passwordLogN = options.passwordLogN;
  registerUserRoutes(app, userOptions);
  registerSyncRoutes(app, { store, nowMs });
  registerAuditRoutes(app, { store, nowMs });
  registerExportRoutes(app, { store, nowMs });
  await serveTabletApp(app, settings.distDir);
  await app.ready();
  return app;
}
