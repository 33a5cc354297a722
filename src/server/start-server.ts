import { resolve } from 'node:path';
import Fastify from 'fastify';
import fastifyStatic from '@fastify/static';
import { coreVersion } from '../core/core-version.ts';

export async function startServer(env: NodeJS.ProcessEnv): Promise<void> {
  const port = Number(env.PORT ?? 8080);
  const host = env.HOST ?? '127.0.0.1';
  const app = Fastify({ logger: false });
  app.get('/api/health', async () => ({ status: 'ok', coreVersion }));
  await app.register(fastifyStatic, { root: resolve('dist'), wildcard: false });
  app.setNotFoundHandler((request, reply) => {
    if (request.url.startsWith('/api/')) return reply.code(404).send({ error: 'not found' });
    return reply.sendFile('index.html');
  });
  await app.listen({ port, host });
  console.log(`Rhythm Ledger is running at http://${host}:${port}/`);
}
