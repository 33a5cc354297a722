import type { ReadAnalysis } from './analyze-read.ts';
import type { FieldError } from './field-error.ts';
import type { ReadView } from './read-derivation.ts';
import { currentReadView, deriveRead, previousFiguresOf } from './read-derivation.ts';
import type { Amendment, SignedRead, Stay } from './records.ts';
import type { UnitPolicy } from './unit-policy.ts';

/** One stay's reads and amendments, with the bed it is on: the unit of every export. */
export interface StayReads {
  stay: Stay;
  bedLabel: string;
  reads: readonly SignedRead[];
  amendments: readonly Amendment[];
}

/** A read exported without figures because its stored counts could not be derived, and why. */
export interface ExportProblem {
  readId: string;
  stayId: string;
  errors: FieldError[];
}

/** One read of a stay as it stands now: amendments applied, figures derived by this core, or the reasons they could not be. */
export interface DerivedRead {
  view: ReadView;
  /** Strip time after amendments: the time the read describes. */
  stripTimeMs: number;
  /** Null when the stored counts no longer pass validation; `errors` then says why, field by field. */
  analysis: ReadAnalysis | null;
  errors: FieldError[];
  /** The read whose figures this one was compared with (the last derivable read before it), if any. */
  previousReadId: string | null;
}

/**
 * Every read of one stay in strip-time order (ties by id), amendments applied, each derived afresh
 * from its counts with the read before it as the comparison: stored figures are never trusted,
 * so tablet, server, handover and export all show the same arithmetic.
 */
export function deriveStayReads(reads: readonly SignedRead[], amendments: readonly Amendment[], stay: Stay, policy: UnitPolicy): DerivedRead[] {
  const amendmentsByRead = new Map<string, Amendment[]>();
  for (const amendment of amendments) {
    const list = amendmentsByRead.get(amendment.readId);
    if (list) list.push(amendment);
    else amendmentsByRead.set(amendment.readId, [amendment]);
  }
  const views = reads
    .filter((read) => read.stayId === stay.id)
    .map((read) => currentReadView(read, amendmentsByRead.get(read.id) ?? []))
    .sort((a, b) => a.current.stripTimeMs - b.current.stripTimeMs || a.read.id.localeCompare(b.read.id));

  const derived: DerivedRead[] = [];
  let previous: { readId: string; analysis: ReadAnalysis } | null = null;
  for (const view of views) {
    const result = deriveRead(view.current, stay, previous ? previousFiguresOf(previous.analysis) : undefined, policy);
    const entry: DerivedRead = {
      view,
      stripTimeMs: view.current.stripTimeMs,
      analysis: result.ok ? result.value : null,
      errors: result.ok ? [] : result.errors,
      previousReadId: previous?.readId ?? null,
    };
    derived.push(entry);
    if (result.ok) previous = { readId: view.read.id, analysis: result.value };
  }
  return derived;
}
