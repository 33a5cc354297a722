/** One message carried to the next screen ("Read saved"), shown once. */
let pending: string | null = null;

/** Leaves a message for the next screen. */
export function leaveFlash(message: string): void {
  pending = message;
}

/** Takes the waiting message, if any (it is shown once). */
export function takeFlash(): string | null {
  const message = pending;
  pending = null;
  return message;
}
