import type { FieldError } from '../core/field-error.ts';

/** A refusal with its HTTP status and JSON body; thrown anywhere, turned into the answer in one place (answer-error.ts). */
export class HttpError extends Error {
  readonly statusCode: number;
  readonly body: Record<string, unknown>;
  readonly headers: Record<string, string>;
  constructor(statusCode: number, body: Record<string, unknown>, headers: Record<string, string> = {}) {
    super(typeof body.error === 'string' ? body.error : `HTTP ${statusCode}`);
    this.name = 'HttpError';
    this.statusCode = statusCode;
    this.body = body;
    this.headers = headers;
  }
}

/** 400 with field-named errors. */
export const invalidInput = (errors: FieldError[]): HttpError => new HttpError(400, { errors });
/** 401: no session, or it has ended. */
export const notSignedIn = (message: string, code = 'sign-in-needed'): HttpError => new HttpError(401, { error: message, code });
/** 403: signed in, but this user or device may not do this. */
export const notAllowed = (message: string, code = 'not-allowed'): HttpError => new HttpError(403, { error: message, code });
export const notFound = (message: string): HttpError => new HttpError(404, { error: message });
