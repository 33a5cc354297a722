import type { FastifyError, FastifyInstance } from 'fastify';
import { HttpError } from './http-error.ts';
import type { ServerLog } from './server-log.ts';

/** Plain words for Fastify's own refusals of a request body, by error code. */
const bodyRefusals: Record<string, (error: FastifyError) => string> = {
  FST_ERR_CTP_BODY_TOO_LARGE: () => 'body: the request is larger than 1 MB; send fewer changes per push (at most 200)',
  FST_ERR_CTP_INVALID_MEDIA_TYPE: () => 'body: send JSON with Content-Type: application/json',
  FST_ERR_CTP_EMPTY_JSON_BODY: () => 'body: the request body is empty; send a JSON object',
  FST_ERR_CTP_INVALID_CONTENT_LENGTH: () => 'body: the Content-Length header does not match the body',
  FST_ERR_CTP_INVALID_JSON_BODY: () => 'body: the request body is not valid JSON',
};

/** Converts every thrown error into the one JSON answer shape, in one place. Bad input is never a 500. */
export function installErrorAnswer(app: FastifyInstance, log: ServerLog): void {
  app.setErrorHandler((error: FastifyError | HttpError | Error, request, reply) => {
    if (error instanceof HttpError) {
      return reply.code(error.statusCode).headers(error.headers).send(error.body);
    }
    const statusCode = (error as FastifyError).statusCode;
    const code = (error as FastifyError).code;
    if (statusCode !== undefined && statusCode >= 400 && statusCode < 500) {
      const words = (code !== undefined ? bodyRefusals[code]?.(error as FastifyError) : undefined) ?? (error instanceof SyntaxError ? 'body: the request body is not valid JSON' : `body: ${error.message}`);
      return reply.code(statusCode).send({ errors: [{ field: 'body', message: words }] });
    }
    // Only the error's name and code: its message could quote stored data.
    log.error(`${request.method} ${request.routeOptions.url ?? 'unmatched'} failed: ${error.name}${code ? ` ${code}` : ''}`);
    return reply.code(500).send({ error: 'The server could not finish this request; nothing was half-saved. Try again in a moment.' });
  });
}
