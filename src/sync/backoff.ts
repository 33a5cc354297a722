/** How retries spread out: the first wait, the longest, and the growth per failure. */
export interface BackoffPolicy {
  /** Never retry sooner than this, so a run of failures cannot spin. */
  minDelayMs: number;
  baseDelayMs: number;
  maxDelayMs: number;
}

/**
 * Default retry spacing: 1 to 2 s after the first failure, ceiling doubling, never more than 5 minutes,
 * so a tablet back in Wi-Fi range resends within minutes and forty tablets after a server restart
 * do not all knock at once. Common practice, no source.
 */
export const defaultBackoffPolicy: BackoffPolicy = { minDelayMs: 1_000, baseDelayMs: 2_000, maxDelayMs: 300_000 };

/** The upper bound of the wait after a number of failures in a row (1 = the first failure). */
export function backoffCeilingMs(failuresInRow: number, policy: BackoffPolicy = defaultBackoffPolicy): number {
  if (!Number.isFinite(failuresInRow) || failuresInRow < 1) return 0;
  // 2 ** 60 already exceeds any cap; clamping the exponent keeps the arithmetic finite.
  const exponent = Math.min(Math.floor(failuresInRow) - 1, 60);
  return Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** exponent);
}

/**
 * The wait before the next try, with full jitter: a uniform draw between 0 and the ceiling (raised
 * to the policy's minimum), so tablets that failed together retry apart. `random` returns [0, 1)
 * like Math.random.
 */
export function backoffDelayMs(failuresInRow: number, random: () => number, policy: BackoffPolicy = defaultBackoffPolicy): number {
  const draw = Math.min(Math.max(random(), 0), 1);
  return Math.max(policy.minDelayMs, Math.floor(draw * backoffCeilingMs(failuresInRow, policy)));
}
