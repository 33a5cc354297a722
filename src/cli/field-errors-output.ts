import type { FieldError } from '../core/field-error.ts';
import type { CliIo } from './cli-io.ts';

/** Reports refused input the same way for every command: JSON `{ errors }` on stdout for scripts, one line per field on stderr for people. */
export function writeFieldErrors(io: CliIo, command: string, errors: readonly FieldError[]): void {
  io.writeOut(`${JSON.stringify({ errors }, null, 2)}\n`);
  io.writeErr(`rhythm-ledger ${command}: input refused\n${errors.map((e) => `  ${e.message.startsWith(e.field) ? '' : `${e.field}: `}${e.message}\n`).join('')}`);
}
