import { readsToCsv } from '../core/csv-export.ts';
import { readsToFhirBundle } from '../core/fhir-export.ts';
import type { Unit } from '../core/records.ts';
import type { ShiftInstance } from '../core/shifts.ts';
import type { ExportProblem, StayReads } from '../core/stay-reads.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';
import { localDateAt } from '../core/shifts.ts';
import { bedText } from './handover-bed-text.ts';

// Exports are made by the core on the tablet, so they work offline and say exactly what the screen
// says. File names carry the bed and the date, never the patient's alias: downloads folders and
// e-mail attachments outlive the stay.

/** The two export formats (README, "Export formats"). */
export type ExportFormat = 'fhir' | 'csv';

/** A file ready to download, and what it holds for the audit trail. */
export interface ExportFile {
  fileName: string;
  mimeType: string;
  text: string;
  /** Reads in the file. */
  readCount: number;
  /** Reads written without figures because their counts could not be derived. */
  problems: ExportProblem[];
}

const slug = (text: string) =>
  text
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toLowerCase() || 'unit';

const extension: Record<ExportFormat, { suffix: string; mimeType: string }> = {
  fhir: { suffix: 'fhir.json', mimeType: 'application/fhir+json' },
  csv: { suffix: 'csv', mimeType: 'text/csv;charset=utf-8' },
};

function build(format: ExportFormat, unit: Unit, policy: UnitPolicy, stays: readonly StayReads[], nowMs: number, range: { fromMs: number; toMs: number } | null, baseName: string): ExportFile {
  const { suffix, mimeType } = extension[format];
  const fileName = `${baseName}.${suffix}`;
  if (format === 'csv') {
    const result = readsToCsv({ unit, stays, ...(range ?? {}) }, policy);
    return { fileName, mimeType, text: result.csv, readCount: result.rowCount, problems: result.problems };
  }
  const result = readsToFhirBundle({ unit, stays, exportedAtMs: nowMs, ...(range ?? {}) }, policy);
  return { fileName, mimeType, text: `${JSON.stringify(result.bundle, null, 2)}\n`, readCount: result.readCount, problems: result.problems };
}

/** Every read of one stay, as a file named for the unit, the bed and the stay's first day. */
export function stayExportFile(format: ExportFormat, input: { unit: Unit; policy: UnitPolicy; stayReads: StayReads; nowMs: number }): ExportFile {
  const { unit, stayReads } = input;
  const baseName = `${slug(unit.name)}_${slug(bedText(stayReads.bedLabel))}_stay-from-${localDateAt(stayReads.stay.startMs, unit.timeZone)}`;
  return build(format, unit, input.policy, [stayReads], input.nowMs, null, baseName);
}

/** The reads of every bed taken during one shift, as a file named for the unit and the shift. */
export function shiftExportFile(format: ExportFormat, input: { unit: Unit; policy: UnitPolicy; shift: ShiftInstance; stays: readonly StayReads[]; nowMs: number }): ExportFile {
  const { unit, shift } = input;
  const baseName = `${slug(unit.name)}_shift-${shift.startLocalDate}-${slug(shift.name)}`;
  return build(format, unit, input.policy, input.stays, input.nowMs, { fromMs: shift.startMs, toMs: shift.endMs }, baseName);
}
