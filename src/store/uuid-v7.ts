/**
 * UUID version 7 (RFC 9562): 48 bits of Unix time in ms, then random bits. Ids made on the tablet
 * sort by creation time, so the server and the outbox can order them without a shared counter.
 */

const hex = Array.from({ length: 256 }, (_, i) => i.toString(16).padStart(2, '0'));

/** Largest time a v7 UUID can hold: 48 bits of milliseconds. */
export const maxUuidV7TimeMs = 2 ** 48 - 1;

/** A new UUID v7 for the given time; `randomBytes` fills 16 bytes (crypto.getRandomValues by default). */
export function uuidV7(nowMs: number, randomBytes: (bytes: Uint8Array<ArrayBuffer>) => void = (b) => crypto.getRandomValues(b)): string {
  if (!Number.isInteger(nowMs) || nowMs < 0 || nowMs > maxUuidV7TimeMs) {
    throw new RangeError(`nowMs must be a whole number of milliseconds from 0 to ${maxUuidV7TimeMs}; got ${nowMs}`);
  }
  const bytes = new Uint8Array(16);
  randomBytes(bytes);
  // 48-bit big-endian timestamp; division keeps precision beyond 32-bit shifts.
  let time = nowMs;
  for (let i = 5; i >= 0; i -= 1) {
    bytes[i] = time % 256;
    time = Math.floor(time / 256);
  }
  bytes[6] = 0x70 | (bytes[6]! & 0x0f); // version 7
  bytes[8] = 0x80 | (bytes[8]! & 0x3f); // RFC 9562 variant
  const h = Array.from(bytes, (b) => hex[b]!);
  return `${h.slice(0, 4).join('')}-${h.slice(4, 6).join('')}-${h.slice(6, 8).join('')}-${h.slice(8, 10).join('')}-${h.slice(10, 16).join('')}`;
}

/** The creation time in ms held by a v7 UUID. */
export function uuidV7TimeMs(id: string): number {
  return Number.parseInt(id.replace(/-/g, '').slice(0, 12), 16);
}
