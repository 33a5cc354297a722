import type { ReadAnalysis } from '../../core/analyze-read.ts';
import type { FieldError } from '../../core/field-error.ts';
import type { ParseResult } from '../../core/read-input.ts';
import { deriveRead, previousFiguresOf } from '../../core/read-derivation.ts';
import type { SignedRead, Stay, Unit } from '../../core/records.ts';
import { readCountsSchema } from '../../core/records.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../core/unit-policy.ts';
import type { StoredRead, UnitTransaction } from '../storage/store.ts';

const countFields = new Set(Object.keys(readCountsSchema.shape));

/** The analysis a stored read stands at now: its last amendment's, or its own. */
export async function latestAnalysisOf(tx: UnitTransaction, stored: StoredRead): Promise<ReadAnalysis> {
  const amendments = await tx.amendmentsOf(stored.read.id);
  return amendments.at(-1)?.analysis ?? stored.analysis;
}

/**
 * Derives a read's figures and flags with the core, as the server sees it on receipt: the unit's
 * policy, the stay's sex, age, pacing and baseline, and the stay's previous read by strip time.
 * The tablet's own figures are never used.
 */
export async function deriveOnReceipt(tx: UnitTransaction, unit: Unit, stay: Stay, read: SignedRead): Promise<ParseResult<ReadAnalysis>> {
  const policy = applyPolicyOverrides(defaultPolicy, unit.policyOverrides);
  const previous = await tx.previousRead(stay.id, read.stripTimeMs, read.id);
  const previousFigures = previous ? previousFiguresOf(await latestAnalysisOf(tx, previous)) : undefined;
  return deriveRead(read, stay, previousFigures, policy);
}

/**
 * Names a core error's field as it sits in the pushed change: a count under `countsPath`
 * (e.g. record.counts.qtSmallBoxes), a stay value (sex, age, baseline) under `stay.`.
 */
export function fieldInChange(errors: FieldError[], countsPath: (countField: string) => string): FieldError[] {
  return errors.map((e) => {
    const base = e.field.replace(/\[\d+\]$/, '');
    const field = countFields.has(base) ? `${countsPath(base)}${e.field.slice(base.length)}` : `stay.${e.field}`;
    return { ...e, field };
  });
}
