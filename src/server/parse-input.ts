import type { z } from 'zod';
import { fieldErrorsFromZod } from '../core/read-input.ts';
import { invalidInput } from './http-error.ts';

/** Validates a request body or query with a shared schema; refuses with field-named 400 errors. */
export function parseInput<S extends z.ZodType>(schema: S, raw: unknown): z.output<S> {
  const result = schema.safeParse(raw);
  if (!result.success) throw invalidInput(fieldErrorsFromZod(result.error));
  return result.data;
}
