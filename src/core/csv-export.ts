import { coreVersion } from './core-version.ts';
import { roundForDisplay } from './display-rounding.ts';
import type { FieldError } from './field-error.ts';
import { ValidationError } from './field-error.ts';
import { rhythmLabel } from './rhythm-labels.ts';
import type { DerivedRead, ExportProblem, StayReads } from './stay-reads.ts';
import { deriveStayReads } from './stay-reads.ts';
import type { Stay, Unit } from './records.ts';
import type { UnitPolicy } from './unit-policy.ts';
import { isoWithOffset } from './zoned-time-text.ts';

// One row per read, RFC 4180: comma-separated, CRLF line ends, a field quoted when it holds a comma,
// a double quote or a line break, quotes doubled inside. Derived figures carry one decimal (rounded
// half-up with roundForDisplay); flags are the core's, computed on unrounded values. Every cell that
// starts with = + - @, a tab or a carriage return gets a leading single quote, so a spreadsheet
// never runs a nurse's note as a formula (no figure this export writes is negative).

/** One documented column: its header name and what it holds. */
export interface CsvColumn {
  name: string;
  description: string;
}

interface RowContext {
  d: DerivedRead;
  stay: Stay;
  bedLabel: string;
  unit: Unit;
}

const oneDecimal = (value: number | null | undefined): string => (value === null || value === undefined ? '' : String(roundForDisplay(value, 1)));
const raw = (value: number | undefined): string => (value === undefined ? '' : String(value));
const yesNo = (value: boolean): string => (value ? 'yes' : 'no');

const columns: Array<CsvColumn & { cell: (ctx: RowContext) => string }> = [
  { name: 'read_id', description: 'The read\'s id (client-made UUID)', cell: ({ d }) => d.view.read.id },
  { name: 'stay_alias', description: 'Patient alias or initials (never a name)', cell: ({ stay }) => stay.alias },
  { name: 'bed', description: 'Bed label as the unit names it', cell: ({ bedLabel }) => bedLabel },
  { name: 'strip_time', description: 'Strip time after amendments, ISO 8601 with the UTC offset of the unit\'s time zone', cell: ({ d, unit }) => isoWithOffset(d.stripTimeMs, unit.timeZone) },
  { name: 'signed_at', description: 'When the read was signed, ISO 8601 with offset', cell: ({ d, unit }) => isoWithOffset(d.view.read.signedAtMs, unit.timeZone) },
  { name: 'author', description: 'Nurse who signed the read', cell: ({ d }) => d.view.read.authorName },
  { name: 'device', description: 'Device id the read was entered on', cell: ({ d }) => d.view.read.deviceId },
  { name: 'reason', description: 'routine, alarm, rhythm-change, new-drug, post-procedure or other', cell: ({ d }) => d.view.current.reason },
  { name: 'reason_text', description: 'Free-text reason, if any', cell: ({ d }) => d.view.current.reasonText ?? '' },
  { name: 'paper_speed_mm_per_s', description: 'Paper speed, 25 or 50', cell: ({ d }) => String(d.view.current.counts.paperSpeedMmPerS) },
  { name: 'gain_mm_per_mv', description: 'Gain, 5, 10 or 20', cell: ({ d }) => String(d.view.current.counts.gainMmPerMv) },
  { name: 'rr_small_boxes', description: 'R-R counts in small boxes as entered, separated by spaces', cell: ({ d }) => d.view.current.counts.rrSmallBoxes.join(' ') },
  { name: 'pp_small_boxes', description: 'P-P counts in small boxes as entered, separated by spaces', cell: ({ d }) => d.view.current.counts.ppSmallBoxes.join(' ') },
  { name: 'six_second_qrs_count', description: 'QRS complexes counted in six seconds', cell: ({ d }) => raw(d.view.current.counts.sixSecondQrsCount) },
  { name: 'pr_small_boxes', description: 'PR count in small boxes', cell: ({ d }) => raw(d.view.current.counts.prSmallBoxes) },
  { name: 'qrs_small_boxes', description: 'QRS count in small boxes', cell: ({ d }) => raw(d.view.current.counts.qrsSmallBoxes) },
  { name: 'qt_small_boxes', description: 'QT count in small boxes', cell: ({ d }) => raw(d.view.current.counts.qtSmallBoxes) },
  { name: 'rate_bpm', description: 'Ventricular rate, bpm, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.rate.rateBpm) },
  { name: 'rate_method', description: 'single-rr, mean-rr or six-second', cell: ({ d }) => d.analysis?.rate.method ?? '' },
  { name: 'regularity', description: 'regular, irregular or unknown (one R-R or none)', cell: ({ d }) => d.analysis?.rate.regularity ?? '' },
  { name: 'atrial_rate_bpm', description: 'Atrial rate from P-P counts, bpm, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.atrialRate?.meanRateBpm) },
  { name: 'pr_ms', description: 'PR interval, ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.intervals.prMs) },
  { name: 'qrs_ms', description: 'QRS duration, ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.intervals.qrsMs) },
  { name: 'qt_ms', description: 'QT interval, ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.intervals.qtMs) },
  { name: 'rr_used_for_qtc_ms', description: 'R-R the QTc formulas used, ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.qtc?.rrUsedMs) },
  { name: 'qtc_bazett_ms', description: 'QTc by Bazett (1920), ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.qtc?.byFormula.bazett) },
  { name: 'qtc_fridericia_ms', description: 'QTc by Fridericia (1920), ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.qtc?.byFormula.fridericia) },
  { name: 'qtc_framingham_ms', description: 'QTc by Framingham (Sagie 1992), ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.qtc?.byFormula.framingham) },
  { name: 'qtc_hodges_ms', description: 'QTc by Hodges (1983), ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.qtc?.byFormula.hodges) },
  { name: 'qtc_default_formula', description: 'The unit\'s default QTc formula: bazett, fridericia, framingham or hodges', cell: ({ d }) => d.analysis?.defaultQtcFormula ?? '' },
  { name: 'qtc_for_limits_ms', description: 'The QTc the limits were compared with, ms, 1 decimal', cell: ({ d }) => oneDecimal(d.analysis?.qtc?.forFlags.qtcMs) },
  { name: 'qtc_for_limits_basis', description: 'plain, or modified-qt (QT - 0.5 x QRS, corrected) with wide QRS or pacing', cell: ({ d }) => d.analysis?.qtc?.forFlags.basis ?? '' },
  { name: 'qtc_approximate', description: 'yes when the R-R was irregular or came from a six-second count', cell: ({ d }) => (d.analysis?.qtc ? yesNo(d.analysis.qtc.approximate) : '') },
  { name: 'flags', description: 'Flags as code:severity, separated by "; " (most severe first)', cell: ({ d }) => (d.analysis?.flags ?? []).map((f) => `${f.code}:${f.severity}`).join('; ') },
  { name: 'rhythm_label', description: 'Rhythm chosen from the list', cell: ({ d }) => (d.view.current.counts.rhythmLabel ? rhythmLabel(d.view.current.counts.rhythmLabel).name : '') },
  { name: 'rhythm_text', description: 'Free-text rhythm description', cell: ({ d }) => d.view.current.rhythmText ?? '' },
  { name: 'ectopy', description: 'Ectopy noted by the nurse', cell: ({ d }) => d.view.current.ectopy ?? '' },
  { name: 'notes', description: 'The nurse\'s notes on the read', cell: ({ d }) => d.view.current.notes ?? '' },
  { name: 'amended', description: 'yes when the read has amendments (values shown are after them)', cell: ({ d }) => yesNo(d.view.amendments.length > 0) },
  { name: 'amendment_count', description: 'Number of amendments', cell: ({ d }) => String(d.view.amendments.length) },
  { name: 'core_version', description: 'Version of the core that derived the figures in this file', cell: () => coreVersion },
  { name: 'problems', description: 'Why the figures are empty when the stored counts could not be derived', cell: ({ d }) => d.errors.map((e) => e.message).join('; ') },
];

/** The CSV header, column by column, with what each holds (the README documents the same list). */
export const csvColumns: readonly CsvColumn[] = columns.map(({ name, description }) => ({ name, description }));

const formulaStart = /^[=+\-@\t\r]/;

/** One cell, guarded against spreadsheet formulas and quoted per RFC 4180 when needed. */
export function csvCell(value: string): string {
  const guarded = formulaStart.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

/** What to export: one or more stays, optionally only reads in [fromMs, toMs) (a shift). */
export interface CsvExportInput {
  unit: Unit;
  stays: readonly StayReads[];
  fromMs?: number;
  toMs?: number;
  /** Start with a UTF-8 byte-order mark, which some spreadsheet programs need to read accents. */
  byteOrderMark?: boolean;
}

/** The CSV text plus the reads exported without figures. */
export interface CsvExportResult {
  csv: string;
  rowCount: number;
  problems: ExportProblem[];
}

/** The reads of one or more stays as CSV with the documented header, one row per read, figures derived afresh by the core. */
export function readsToCsv(input: CsvExportInput, policy: UnitPolicy): CsvExportResult {
  const errors: FieldError[] = [];
  if (input.fromMs !== undefined && !Number.isFinite(input.fromMs)) errors.push({ field: 'fromMs', message: 'fromMs must be a finite time in epoch milliseconds' });
  if (input.toMs !== undefined && !Number.isFinite(input.toMs)) errors.push({ field: 'toMs', message: 'toMs must be a finite time in epoch milliseconds' });
  if (errors.length === 0 && input.fromMs !== undefined && input.toMs !== undefined && input.toMs <= input.fromMs) {
    errors.push({ field: 'toMs', message: 'toMs must be after fromMs' });
  }
  if (errors.length > 0) throw new ValidationError(errors);

  const lines = [columns.map((c) => csvCell(c.name)).join(',')];
  const problems: ExportProblem[] = [];
  for (const part of input.stays) {
    for (const d of deriveStayReads(part.reads, part.amendments, part.stay, policy)) {
      if (input.fromMs !== undefined && d.stripTimeMs < input.fromMs) continue;
      if (input.toMs !== undefined && d.stripTimeMs >= input.toMs) continue;
      if (!d.analysis) problems.push({ readId: d.view.read.id, stayId: part.stay.id, errors: d.errors });
      const ctx: RowContext = { d, stay: part.stay, bedLabel: part.bedLabel, unit: input.unit };
      lines.push(columns.map((c) => csvCell(c.cell(ctx))).join(','));
    }
  }
  const csv = `${input.byteOrderMark ? '\uFEFF' : ''}${lines.join('\r\n')}\r\n`;
  return { csv, rowCount: lines.length - 1, problems };
}
