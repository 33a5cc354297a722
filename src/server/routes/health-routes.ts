import type { FastifyInstance } from 'fastify';
import { coreVersion } from '../../core/core-version.ts';
import { serverVersion } from '../server-version.ts';
import type { StorageKind } from '../storage/store.ts';

/** Liveness for load balancers and tablets: no session, no patient data. */
export function registerHealthRoutes(app: FastifyInstance, { storage }: { storage: StorageKind }): void {
  app.get('/api/health', { config: { access: 'public' } }, async () => ({ status: 'ok', storage, coreVersion, serverVersion }));
}
