import type { FastifyInstance } from 'fastify';

/**
 * Content-security policy for the tablet app: only our own origin, no inline scripts,
 * images from us or data: URLs (generated icons), never framed by another site.
 */
export const contentSecurityPolicy = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self'",
  "manifest-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join('; ');

/** Headers sent on every answer, API and app alike. */
export const securityHeaders: Record<string, string> = {
  'content-security-policy': contentSecurityPolicy,
  'x-content-type-options': 'nosniff',
  'x-frame-options': 'DENY',
  'referrer-policy': 'no-referrer',
  'cross-origin-opener-policy': 'same-origin',
  'cross-origin-resource-policy': 'same-origin',
  'permissions-policy': 'camera=(), microphone=(), geolocation=(), payment=(), usb=()',
  // Browsers honour this only over HTTPS, which the reverse proxy in front provides.
  'strict-transport-security': 'max-age=31536000',
};

/** Adds the security headers to every answer, and forbids caching API answers (they hold patient data). */
export function installSecurityHeaders(app: FastifyInstance): void {
  app.addHook('onSend', async (request, reply, payload) => {
    reply.headers(securityHeaders);
    reply.removeHeader('x-powered-by');
    if (request.url.startsWith('/api/')) reply.header('cache-control', 'no-store');
    return payload;
  });
}
