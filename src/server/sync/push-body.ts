import { invalidInput } from '../http-error.ts';

/** At most this many changes in one push; the tablet sends its outbox in batches of this size or fewer. */
export const maxChangesPerPush = 200;

/** The changes array of a push body, or a field-named 400 when the body as a whole is unusable. */
export function changesOfPushBody(body: unknown): unknown[] {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw invalidInput([{ field: 'body', message: 'body must be a JSON object of the form { "changes": [...] }' }]);
  }
  const changes = (body as { changes?: unknown }).changes;
  if (!Array.isArray(changes)) throw invalidInput([{ field: 'changes', message: 'changes must be a list of outbox changes' }]);
  if (changes.length > maxChangesPerPush) {
    throw invalidInput([{ field: 'changes', max: maxChangesPerPush, message: `changes: at most ${maxChangesPerPush} changes in one push; got ${changes.length}. Send the rest in the next push.` }]);
  }
  const extra = Object.keys(body).filter((k) => k !== 'changes');
  if (extra.length > 0) throw invalidInput([{ field: 'body', message: `body: unknown field(s) ${extra.join(', ')}; only "changes" is expected` }]);
  return changes;
}
