import type { Store } from '../storage/store.ts';

/** How many failed sign-ins are allowed for one username from one address, within how long. */
export interface SignInLimit {
  maxFailures: number;
  windowMs: number;
}

/** Failures are counted per username and client address, in the database, so every server process shares the count. */
export function signInAttemptKey(username: string, clientAddress: string): string {
  return `${username.trim().toLowerCase()}|${clientAddress}`;
}

/** Zero when a sign-in may be tried now; otherwise the seconds until the oldest counted failure leaves the window. */
export async function signInRetryAfterS(store: Store, attemptKey: string, limit: SignInLimit, nowMs: number): Promise<number> {
  const sinceMs = nowMs - limit.windowMs;
  const failures = await store.countSignInFailuresSince(attemptKey, sinceMs);
  if (failures < limit.maxFailures) return 0;
  const oldestMs = (await store.oldestSignInFailureSince(attemptKey, sinceMs)) ?? nowMs;
  return Math.max(1, Math.ceil((oldestMs + limit.windowMs - nowMs) / 1000));
}
