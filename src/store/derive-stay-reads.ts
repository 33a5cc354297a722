import { currentReadView, deriveRead, previousFiguresOf } from '../core/read-derivation.ts';
import type { PreviousFigures } from '../core/read-input.ts';
import type { Amendment, SignedRead, Stay } from '../core/records.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';

/** Orders reads by strip time, oldest first (ties by id, which sorts by creation for v7 ids). */
export function byStripTime<T extends Pick<SignedRead, 'stripTimeMs' | 'id'>>(a: T, b: T): number {
  return a.stripTimeMs - b.stripTimeMs || a.id.localeCompare(b.id);
}

/** The last read's figures before a strip time, for change-from-last-read flags (figures only, so no chain is needed). */
export function previousFiguresBefore(
  stay: Stay,
  reads: readonly SignedRead[],
  amendments: readonly Amendment[],
  policy: UnitPolicy,
  stripTimeMs: number,
  excludeReadId?: string,
): PreviousFigures | undefined {
  const earlier = reads
    .filter((r) => r.stayId === stay.id && r.id !== excludeReadId)
    .map((r) => currentReadView(r, amendments).current)
    .filter((r) => r.stripTimeMs < stripTimeMs)
    .sort(byStripTime);
  for (let i = earlier.length - 1; i >= 0; i -= 1) {
    const derived = deriveRead(earlier[i]!, stay, undefined, policy);
    if (derived.ok) return previousFiguresOf(derived.value);
  }
  return undefined;
}
