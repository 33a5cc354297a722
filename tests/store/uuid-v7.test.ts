import { describe, expect, it } from 'vitest';
import { maxUuidV7TimeMs, uuidV7, uuidV7TimeMs } from '../../src/store/uuid-v7.ts';

describe('uuidV7', () => {
  it('writes the time as the first 48 bits, version 7 and the RFC 9562 variant', () => {
    const id = uuidV7(0x0123456789ab, (b) => b.fill(0xff));
    expect(id).toBe('01234567-89ab-7fff-bfff-ffffffffffff');
    expect(uuidV7TimeMs(id)).toBe(0x0123456789ab);
  });

  it('sorts ids made later after ids made earlier, as text', () => {
    const earlier = uuidV7(Date.UTC(2026, 0, 1), (b) => b.fill(0xff));
    const later = uuidV7(Date.UTC(2026, 0, 1) + 1, (b) => b.fill(0));
    expect(earlier < later).toBe(true);
  });

  it('gives different ids in the same millisecond from real random bytes', () => {
    const ids = new Set(Array.from({ length: 200 }, () => uuidV7(1_700_000_000_000)));
    expect(ids.size).toBe(200);
    for (const id of ids) expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
  });

  describe('edge cases', () => {
    it('accepts time 0 and the largest 48-bit time', () => {
      expect(uuidV7TimeMs(uuidV7(0))).toBe(0);
      expect(uuidV7TimeMs(uuidV7(maxUuidV7TimeMs))).toBe(maxUuidV7TimeMs);
    });
    it.each([-1, 1.5, Number.NaN, maxUuidV7TimeMs + 1])('refuses time %s with a message naming nowMs', (bad) => {
      expect(() => uuidV7(bad)).toThrow(/nowMs must be a whole number/);
    });
  });
});
