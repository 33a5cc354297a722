import type { FastifyInstance } from 'fastify';
import { buildApp } from './build-app.ts';
import type { ServerLog } from './server-log.ts';
import type { ServerSettings } from './settings.ts';
import { describeStorage, openStore } from './storage/open-store.ts';
import type { Store } from './storage/store.ts';

export interface RunningServer {
  url: string;
  app: FastifyInstance;
  store: Store;
  /** Stops taking requests, lets those in flight finish, then closes the database. */
  close(): Promise<void>;
}

/** The command that creates the first unit admin, shown when the server has no accounts yet. */
export const firstAdminHint =
  'No accounts yet. Create the unit and its first unit admin (type the password, then Enter and Ctrl-D):\n' +
  '  npx rhythm-ledger admin create --unit-name "4 West Telemetry" --time-zone Europe/Dublin --username admin --name "A. Admin" --password-stdin';

/** Opens storage (running migrations), builds the app and listens on HOST:PORT. */
export async function startServer(settings: ServerSettings, log: ServerLog, print: (line: string) => void = console.log): Promise<RunningServer> {
  const store = await openStore(settings);
  let app: FastifyInstance;
  try {
    app = await buildApp({ store, settings, log });
    await app.listen({ port: settings.port, host: settings.host });
  } catch (error) {
    await store.close();
    throw error;
  }
  const address = app.server.address();
  const port = typeof address === 'object' && address ? address.port : settings.port;
  const url = `http://${settings.host.includes(':') ? `[${settings.host}]` : settings.host}:${port}/`;
  print(`Rhythm Ledger unit server is running at ${url} (${describeStorage(settings)}).`);
  if ((await store.countUsers()) === 0) print(firstAdminHint);
  return {
    url,
    app,
    store,
    async close() {
      await app.close();
      await store.close();
    },
  };
}
