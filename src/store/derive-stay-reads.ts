import type { ReadAnalysis } from '../core/analyze-read.ts';
import type { FieldError } from '../core/field-error.ts';
import type { ReadView } from '../core/read-derivation.ts';
import { currentReadView, deriveRead, previousFiguresOf } from '../core/read-derivation.ts';
import type { PreviousFigures } from '../core/read-input.ts';
import type { Amendment, SignedRead, Stay } from '../core/records.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';

/** One read of a stay with its current view and the figures the core derives for it. */
export interface DerivedStayRead {
  view: ReadView;
  analysis: ReadAnalysis | null;
  /** Why the core could not derive figures (counts amended out of range, a newer core's rules). */
  errors: FieldError[];
}

/** Orders reads by strip time, oldest first (ties by id, which sorts by creation for v7 ids). */
export function byStripTime<T extends Pick<SignedRead, 'stripTimeMs' | 'id'>>(a: T, b: T): number {
  return a.stripTimeMs - b.stripTimeMs || a.id.localeCompare(b.id);
}

/**
 * Every read of one stay, oldest first, each derived by the core with the one before it as "last
 * read", so change-from-last-read flags match what the nurse saw when signing.
 */
export function deriveStayReads(stay: Stay, reads: readonly SignedRead[], amendments: readonly Amendment[], policy: UnitPolicy): DerivedStayRead[] {
  const ordered = reads.filter((r) => r.stayId === stay.id).map((r) => currentReadView(r, amendments));
  ordered.sort((a, b) => byStripTime(a.current, b.current));
  const result: DerivedStayRead[] = [];
  let previous: PreviousFigures | undefined;
  for (const view of ordered) {
    const derived = deriveRead(view.current, stay, previous, policy);
    if (derived.ok) {
      result.push({ view, analysis: derived.value, errors: [] });
      previous = previousFiguresOf(derived.value);
    } else {
      result.push({ view, analysis: null, errors: derived.errors });
    }
  }
  return result;
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
