import { existsSync } from 'node:fs';
import { join } from 'node:path';
import fastifyStatic from '@fastify/static';
import type { FastifyInstance } from 'fastify';

/** Hashed build assets never change under the same name; everything else must be revalidated (index.html, the service worker, the manifest). */
export function cacheControlFor(filePath: string): string {
  return /[\\/]assets[\\/]/.test(filePath) ? 'public, max-age=31536000, immutable' : 'no-cache';
}

/**
 * Serves the built tablet app from `distDir`, with index.html for any other navigation so the app's
 * own routes work on reload; unknown /api/ paths answer a JSON 404.
 */
export async function serveTabletApp(app: FastifyInstance, distDir: string): Promise<void> {
  const built = existsSync(join(distDir, 'index.html'));
  if (built) {
    await app.register(fastifyStatic, {
      root: distDir,
      wildcard: true,
      index: ['index.html'],
      cacheControl: false,
      setHeaders: (res, filePath) => res.setHeader('cache-control', cacheControlFor(filePath)),
    });
  }
  app.setNotFoundHandler((request, reply) => {
    if (request.url.startsWith('/api/') || request.url === '/api') return reply.code(404).send({ error: `No API route ${request.method} ${request.url.split('?')[0]}` });
    const wantsPage = (request.method === 'GET' || request.method === 'HEAD') && !/\.[a-z0-9]{1,8}$/i.test(request.url.split('?')[0] ?? '');
    if (!wantsPage) return reply.code(404).type('text/plain').send('Not found');
    if (!built) return reply.code(404).type('text/plain').send('The tablet app is not built yet: run npm run build (npm start does it for you).');
    return reply.header('cache-control', 'no-cache').sendFile('index.html');
  });
}
