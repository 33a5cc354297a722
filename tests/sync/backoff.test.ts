import { describe, expect, it } from 'vitest';
import { backoffCeilingMs, backoffDelayMs, defaultBackoffPolicy } from '../../src/sync/backoff.ts';

// Retry spacing is engineering, not clinical arithmetic: common practice, no source.
const policy = { minDelayMs: 1_000, baseDelayMs: 2_000, maxDelayMs: 300_000 };

describe('backoffCeilingMs', () => {
  it('doubles with each failure in a row: 2 s, 4 s, 8 s, 16 s', () => {
    expect([1, 2, 3, 4].map((n) => backoffCeilingMs(n, policy))).toEqual([2_000, 4_000, 8_000, 16_000]);
  });

  it('never exceeds the 5-minute cap, even after a thousand failures', () => {
    expect(backoffCeilingMs(8, policy)).toBe(256_000);
    expect(backoffCeilingMs(9, policy)).toBe(300_000);
    expect(backoffCeilingMs(1_000, policy)).toBe(300_000);
  });

  describe('edge cases', () => {
    it('is 0 for no failures, negative counts and NaN', () => {
      expect(backoffCeilingMs(0, policy)).toBe(0);
      expect(backoffCeilingMs(-3, policy)).toBe(0);
      expect(backoffCeilingMs(Number.NaN, policy)).toBe(0);
    });
  });
});

describe('backoffDelayMs', () => {
  it('draws uniformly under the ceiling: half way up is half the ceiling', () => {
    expect(backoffDelayMs(4, () => 0.5, policy)).toBe(8_000);
    expect(backoffDelayMs(4, () => 0.999, policy)).toBe(15_984);
  });

  it('never waits less than the minimum, so a run of failures cannot spin', () => {
    expect(backoffDelayMs(1, () => 0, policy)).toBe(1_000);
    expect(backoffDelayMs(6, () => 0, policy)).toBe(1_000);
  });

  it('spreads many tablets out: 1000 draws after the 5th failure stay in bounds and are not all alike', () => {
    let state = 42;
    // A small linear congruential generator keeps the draw repeatable.
    const random = () => {
      state = (state * 1_103_515_245 + 12_345) % 2 ** 31;
      return state / 2 ** 31;
    };
    const delays = Array.from({ length: 1_000 }, () => backoffDelayMs(5, random, policy));
    expect(Math.min(...delays)).toBeGreaterThanOrEqual(1_000);
    expect(Math.max(...delays)).toBeLessThan(32_000);
    expect(new Set(delays).size).toBeGreaterThan(900);
    const mean = delays.reduce((a, b) => a + b, 0) / delays.length;
    // Full jitter over 0-32 s (raised to 1 s at the bottom) averages close to 16 s.
    expect(mean).toBeGreaterThan(14_500);
    expect(mean).toBeLessThan(17_500);
  });

  it('keeps a draw outside [0, 1) inside the bounds', () => {
    expect(backoffDelayMs(3, () => 7, policy)).toBe(8_000);
    expect(backoffDelayMs(3, () => -1, policy)).toBe(1_000);
  });

  it('defaults to 1 s minimum, 2 s base and a 5-minute cap', () => {
    expect(defaultBackoffPolicy).toEqual({ minDelayMs: 1_000, baseDelayMs: 2_000, maxDelayMs: 300_000 });
  });
});
