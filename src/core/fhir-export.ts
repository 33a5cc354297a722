import type { ReadAnalysis } from './analyze-read.ts';
import { roundForDisplay } from './display-rounding.ts';
import type { FieldError } from './field-error.ts';
import { ValidationError } from './field-error.ts';
import type { FlagFigure } from './flag-figure.ts';
import { figureOfFlag } from './flag-figure.ts';
import type { LoincCode } from './loinc-codes.ts';
import {
  administrativeGenderSystem,
  dataAbsentReasonSystem,
  heartRateProfile,
  interpretationSystem,
  loincCodes,
  loincSystem,
  observationCategorySystem,
  qtcLoincCode,
  ucumSystem,
  vitalSignsProfile,
} from './loinc-codes.ts';
import type { Flag } from './read-flags.ts';
import type { QtcFormula } from './qtc.ts';
import { qtcFormulaNames } from './qtc.ts';
import type { Stay, Unit } from './records.ts';
import { rhythmLabel } from './rhythm-labels.ts';
import type { DerivedRead, ExportProblem, StayReads } from './stay-reads.ts';
import { deriveStayReads } from './stay-reads.ts';
import type { ThresholdKey, UnitPolicy } from './unit-policy.ts';
import { thresholdComparators } from './unit-policy.ts';
import { isoWithOffset } from './zoned-time-text.ts';

// Rounding: valueQuantity carries the figure rounded half-up to 1 ms (1 /min for rate) with
// roundForDisplay, as the app shows it; interpretation codes come from the core's flags, which
// compare unrounded values. So a QTc of 499.6 ms exports as 500 ms without the 'HH' code, exactly
// as the screen shows it. Only reads the core can derive from their counts get figures; a read
// whose counts no longer validate is exported as a heart-rate Observation with a data-absent
// reason and the field errors in its note, and is listed in the result's problems.

/** A FHIR R4 Coding. */
export interface FhirCoding {
  system?: string;
  code?: string;
  display?: string;
}
/** A FHIR R4 CodeableConcept. */
export interface FhirCodeableConcept {
  coding?: FhirCoding[];
  text?: string;
}
/** A FHIR R4 Quantity with a UCUM unit. */
export interface FhirQuantity {
  value: number;
  unit: string;
  system: string;
  code: string;
}
/** A FHIR R4 Reference (display-only references are allowed). */
export interface FhirReference {
  reference?: string;
  type?: 'Patient' | 'Practitioner' | 'Device';
  identifier?: { system?: string; value: string };
  display?: string;
}
/** A FHIR R4 Observation.referenceRange entry. */
export interface FhirReferenceRange {
  low?: FhirQuantity;
  high?: FhirQuantity;
  appliesTo?: FhirCodeableConcept[];
  text?: string;
}
/** The FHIR R4 Observation fields this export writes. */
export interface FhirObservation {
  resourceType: 'Observation';
  id: string;
  meta?: { profile: string[] };
  identifier: Array<{ system?: string; value: string }>;
  status: 'final' | 'amended';
  category: FhirCodeableConcept[];
  code: FhirCodeableConcept;
  subject: FhirReference;
  effectiveDateTime: string;
  issued: string;
  performer: FhirReference[];
  valueQuantity?: FhirQuantity;
  valueString?: string;
  valueCodeableConcept?: FhirCodeableConcept;
  dataAbsentReason?: FhirCodeableConcept;
  interpretation?: FhirCodeableConcept[];
  note?: Array<{ text: string }>;
  method?: FhirCodeableConcept;
  device?: FhirReference;
  referenceRange?: FhirReferenceRange[];
}
/** A FHIR R4 Bundle of type collection. */
export interface FhirBundle {
  resourceType: 'Bundle';
  type: 'collection';
  timestamp: string;
  entry: Array<{ fullUrl?: string; resource: FhirObservation }>;
}

/** What to export: one or more stays, optionally only reads in [fromMs, toMs) (a shift). */
export interface FhirExportInput {
  unit: Unit;
  stays: readonly StayReads[];
  fromMs?: number;
  toMs?: number;
  /** Bundle.timestamp; passed in because the core reads no clock. */
  exportedAtMs: number;
  /** Base for entry fullUrl (e.g. 'https://ward.example.org/fhir'); entries carry no fullUrl when absent. */
  fullUrlBase?: string;
  /** System URI for Observation.identifier values; the identifier carries only its value when absent. */
  identifierSystem?: string;
}

/** The Bundle plus what the caller (who audits every export) needs to know about it. */
export interface FhirExportResult {
  bundle: FhirBundle;
  readCount: number;
  problems: ExportProblem[];
}

/** The formula behind each QTc, written out for Observation.method (clinical-reference §4). */
const qtcFormulaExpressions: Record<QtcFormula, string> = {
  bazett: 'QTc = QT / RR^(1/2), RR in seconds',
  fridericia: 'QTc = QT / RR^(1/3), RR in seconds',
  framingham: 'QTc = QT + 154 ms x (1 - RR), RR in seconds',
  hodges: 'QTc = QT + 1.75 ms x (HR - 60), HR in /min',
};

const interpretationDisplay = {
  H: 'High',
  HH: 'Critical high',
  L: 'Low',
  LL: 'Critical low',
  U: 'Significant change up',
} as const;
type InterpretationCode = keyof typeof interpretationDisplay;

/** HL7 v3 interpretation codes for one figure's flags: direction from the limit, 'critical' when urgent, 'U' for a rise. */
export function interpretationCodes(flags: readonly Flag[]): InterpretationCode[] {
  const codes = new Set<InterpretationCode>();
  for (const flag of flags) {
    if (flag.code === 'qtc-rise-from-baseline' || flag.code === 'qtc-rise-since-last-read') {
      codes.add('U');
      continue;
    }
    if (flag.code === 'qtc-not-compared' || flag.code === 'adult-thresholds') continue;
    const low = flag.limit.comparator === '<' || flag.limit.comparator === '<=';
    const urgent = flag.severity === 'urgent';
    codes.add(low ? (urgent ? 'LL' : 'L') : urgent ? 'HH' : 'H');
  }
  if (codes.has('HH')) codes.delete('H');
  if (codes.has('LL')) codes.delete('L');
  const order: InterpretationCode[] = ['HH', 'H', 'LL', 'L', 'U'];
  return order.filter((c) => codes.has(c));
}

const safeIdPart = (id: string): string => id.replace(/[^A-Za-z0-9.-]/g, '-');

function quantity(value: number, unit: 'bpm' | 'ms'): FhirQuantity {
  return unit === 'bpm'
    ? { value: roundForDisplay(value), unit: 'beats/minute', system: ucumSystem, code: '/min' }
    : { value: roundForDisplay(value), unit: 'ms', system: ucumSystem, code: 'ms' };
}

const comparatorWords: Record<'<' | '>' | '>=' | '<=', string> = { '<': 'below', '>': 'above', '>=': 'at or above', '<=': 'at or below' };

function limitText(key: ThresholdKey, policy: UnitPolicy, unit: string): string {
  return `${comparatorWords[thresholdComparators[key]]} ${policy.thresholds[key].value} ${unit}`;
}

function codeable(code: LoincCode): FhirCodeableConcept {
  return { coding: [{ system: loincSystem, code: code.code, display: code.display }], text: code.display };
}

function category(code: 'vital-signs' | 'procedure'): FhirCodeableConcept[] {
  return [{ coding: [{ system: observationCategorySystem, code, display: code === 'vital-signs' ? 'Vital Signs' : 'Procedure' }] }];
}

function gender(sex: 'male' | 'female'): FhirCodeableConcept {
  const display = sex === 'male' ? 'Male' : 'Female';
  return { coding: [{ system: administrativeGenderSystem, code: sex, display }], text: display };
}

function qtcRanges(stay: Stay, policy: UnitPolicy): FhirReferenceRange[] {
  const t = policy.thresholds;
  const sexes: Array<'male' | 'female'> = stay.sex === 'unknown' ? ['male', 'female'] : [stay.sex];
  return sexes.map((sex) => {
    const key: ThresholdKey = sex === 'male' ? 'qtcProlongedMaleMs' : 'qtcProlongedFemaleMs';
    const unknownNote = stay.sex === 'unknown' ? ' Sex not recorded: the lower of the two limits was applied.' : '';
    return {
      low: quantity(t.qtcShortMs.value, 'ms'),
      high: quantity(t[key].value, 'ms'),
      appliesTo: [gender(sex)],
      text: `Unit limits, ${sex}: flagged ${limitText('qtcShortMs', policy, 'ms')} (short) or ${limitText(key, policy, 'ms')} (prolonged); ${limitText('qtcHighRiskMs', policy, 'ms')} is high risk.${unknownNote}`,
    };
  });
}

interface ReadContext {
  d: DerivedRead;
  stay: Stay;
  unit: Unit;
  input: FhirExportInput;
}

function baseObservation(ctx: ReadContext, suffix: string, code: LoincCode, kind: 'vital-signs' | 'procedure'): FhirObservation {
  const { d, stay, unit, input } = ctx;
  const read = d.view.current;
  const readId = d.view.read.id;
  const id = `${safeIdPart(readId).slice(0, 63 - suffix.length)}-${suffix}`;
  const identifier = input.identifierSystem ? { system: input.identifierSystem, value: `${readId}/${suffix}` } : { value: `${readId}/${suffix}` };
  const observation: FhirObservation = {
    resourceType: 'Observation',
    id,
    identifier: [identifier],
    status: d.view.amendments.length > 0 ? 'amended' : 'final',
    category: category(kind),
    code: codeable(code),
    subject: { display: stay.alias },
    effectiveDateTime: isoWithOffset(d.stripTimeMs, unit.timeZone),
    issued: new Date(read.signedAtMs).toISOString(),
    performer: [{ type: 'Practitioner', identifier: { value: read.authorId }, display: read.authorName }],
  };
  if (read.deviceId.trim() !== '') observation.device = { display: read.deviceId.trim() };
  return observation;
}

function addNotes(observation: FhirObservation, notes: string[]): void {
  const texts = notes.map((n) => n.trim()).filter((n) => n !== '');
  if (texts.length > 0) observation.note = [...(observation.note ?? []), ...texts.map((text) => ({ text }))];
}

function amendmentNotes(d: DerivedRead, timeZone: string): string[] {
  return d.view.amendments.map((a) => `Amended ${isoWithOffset(a.createdAtMs, timeZone)} by ${a.authorName} (${Object.keys(a.changes).join(', ')}): ${a.reason}`);
}

function withFlags(observation: FhirObservation, analysis: ReadAnalysis, figure: FlagFigure): void {
  const flags = analysis.flags.filter((f) => figureOfFlag(f.code) === figure);
  const codes = interpretationCodes(flags);
  if (codes.length > 0) {
    observation.interpretation = codes.map((c) => ({ coding: [{ system: interpretationSystem, code: c, display: interpretationDisplay[c] }], text: interpretationDisplay[c] }));
  }
  addNotes(observation, flags.map((f) => `${f.sentence} Source: ${f.source}.`));
}

function intervalMethod(boxes: number | undefined, analysis: ReadAnalysis): FhirCodeableConcept {
  const count = boxes === undefined ? '' : `${boxes} small boxes `;
  return { text: `Hand count on a monitor rhythm strip: ${count}at ${analysis.paperSpeedMmPerS} mm/s (${analysis.smallBoxMs} ms per small box); lead not recorded.` };
}

function observationsOfRead(ctx: ReadContext, policy: UnitPolicy): FhirObservation[] {
  const { d, stay } = ctx;
  const read = d.view.current;
  const analysis = d.analysis;
  const t = policy.thresholds;
  const heartRate = baseObservation(ctx, 'heart-rate', loincCodes.heartRate, 'vital-signs');
  heartRate.meta = { profile: [vitalSignsProfile, heartRateProfile] };
  if (!analysis) {
    heartRate.dataAbsentReason = { coding: [{ system: dataAbsentReasonSystem, code: 'error', display: 'Error' }], text: 'The stored counts could not be derived' };
    addNotes(heartRate, [...d.errors.map((e) => e.message), ...amendmentNotes(d, ctx.unit.timeZone)]);
    return [heartRate];
  }
  const observations: FhirObservation[] = [heartRate];
  heartRate.valueQuantity = quantity(analysis.rate.rateBpm, 'bpm');
  heartRate.method = { text: analysis.rate.methodDescription };
  heartRate.referenceRange = [
    {
      low: quantity(t.rateLowBpm.value, 'bpm'),
      high: quantity(t.rateHighBpm.value, 'bpm'),
      text: `Unit limits: flagged ${limitText('rateLowBpm', policy, '/min')} or ${limitText('rateHighBpm', policy, '/min')}.`,
    },
  ];
  withFlags(heartRate, analysis, 'rateBpm');
  addNotes(heartRate, amendmentNotes(d, ctx.unit.timeZone));

  if (analysis.rate.regularity !== 'unknown') {
    const rhythm = baseObservation(ctx, 'rr-regularity', loincCodes.heartRateRhythm, 'procedure');
    const regular = analysis.rate.regularity === 'regular';
    const spread = analysis.rate.rr ? ` (R-R spread ${roundForDisplay(analysis.rate.rr.spreadMs)} ms across ${analysis.rate.rr.intervalsMs.length} intervals)` : '';
    rhythm.valueCodeableConcept = { text: regular ? 'Regular' : 'Irregular' };
    rhythm.method = { text: `R-R regular when the longest minus the shortest is at most ${policy.regularity.maxSpreadMs} ms or ${policy.regularity.maxSpreadPercentOfMean}% of the mean${spread}.` };
    observations.push(rhythm);
  }

  if (analysis.intervals.prMs !== null) {
    const pr = baseObservation(ctx, 'pr', loincCodes.prIntervalLead, 'procedure');
    pr.valueQuantity = quantity(analysis.intervals.prMs, 'ms');
    pr.method = intervalMethod(read.counts.prSmallBoxes, analysis);
    pr.referenceRange = [{ low: quantity(t.prShortMs.value, 'ms'), high: quantity(t.prLongMs.value, 'ms'), text: `Unit limits: flagged ${limitText('prShortMs', policy, 'ms')} or ${limitText('prLongMs', policy, 'ms')}.` }];
    withFlags(pr, analysis, 'prMs');
    observations.push(pr);
  }
  if (analysis.intervals.qrsMs !== null) {
    const qrs = baseObservation(ctx, 'qrs', loincCodes.qrsDurationLead, 'procedure');
    qrs.valueQuantity = quantity(analysis.intervals.qrsMs, 'ms');
    qrs.method = intervalMethod(read.counts.qrsSmallBoxes, analysis);
    qrs.referenceRange = [{ high: quantity(t.qrsWideMs.value, 'ms'), text: `Unit limits: flagged ${limitText('qrsWideMs', policy, 'ms')} (wide QRS).` }];
    withFlags(qrs, analysis, 'qrsMs');
    observations.push(qrs);
  }
  if (analysis.intervals.qtMs !== null && analysis.qtc) {
    const qtc = analysis.qtc;
    const qt = baseObservation(ctx, 'qt', loincCodes.qtIntervalLead, 'procedure');
    qt.valueQuantity = quantity(analysis.intervals.qtMs, 'ms');
    qt.method = intervalMethod(read.counts.qtSmallBoxes, analysis);
    observations.push(qt);

    const formula = qtc.defaultFormula;
    const corrected = baseObservation(ctx, 'qtc', qtcLoincCode(formula), 'procedure');
    corrected.valueQuantity = quantity(qtc.byFormula[formula], 'ms');
    corrected.method = { text: `${qtcFormulaNames[formula]}: ${qtcFormulaExpressions[formula]}; R-R used: ${qtc.rrUsedDescription}.` };
    corrected.referenceRange = qtcRanges(stay, policy);
    const notes: string[] = [];
    if (qtc.forFlags.basis === 'modified-qt') {
      notes.push(`Limits were compared with ${qtc.forFlags.figure} = ${roundForDisplay(qtc.forFlags.qtcMs)} ms, not with this plain QTc, because the QRS is wide or the rhythm is paced (Bogossian et al. 2014).`);
    }
    if (qtc.approximate) notes.push('Approximate: the R-R used for correction is irregular or derived from a six-second count.');
    notes.push(...qtc.warnings.map((w) => w.message));
    if (stay.baselineQtcMs !== undefined) notes.push(`Baseline QTc for this stay: ${roundForDisplay(stay.baselineQtcMs)} ms.`);
    addNotes(corrected, notes);
    withFlags(corrected, analysis, 'qtcMs');
    observations.push(corrected);
  }

  const label = read.counts.rhythmLabel ? rhythmLabel(read.counts.rhythmLabel).name : '';
  const impressionParts = [label, read.rhythmText?.trim() ?? '', read.ectopy?.trim() ? `ectopy: ${read.ectopy.trim()}` : ''].filter((p) => p !== '');
  if (impressionParts.length > 0) {
    const impression = baseObservation(ctx, 'impression', loincCodes.ekgImpression, 'procedure');
    impression.valueString = impressionParts.join('; ');
    addNotes(impression, analysis.questions.map((q) => `Question raised by the figures: ${q.question}`));
    observations.push(impression);
  }
  return observations;
}

function checkRange(input: FhirExportInput): void {
  const errors: FieldError[] = [];
  if (!Number.isFinite(input.exportedAtMs)) errors.push({ field: 'exportedAtMs', message: 'exportedAtMs must be a finite time in epoch milliseconds' });
  if (input.fromMs !== undefined && !Number.isFinite(input.fromMs)) errors.push({ field: 'fromMs', message: 'fromMs must be a finite time in epoch milliseconds' });
  if (input.toMs !== undefined && !Number.isFinite(input.toMs)) errors.push({ field: 'toMs', message: 'toMs must be a finite time in epoch milliseconds' });
  if (errors.length === 0 && input.fromMs !== undefined && input.toMs !== undefined && input.toMs <= input.fromMs) {
    errors.push({ field: 'toMs', message: 'toMs must be after fromMs' });
  }
  if (input.fullUrlBase !== undefined && !/^(https?:\/\/|urn:)\S+$/.test(input.fullUrlBase)) {
    errors.push({ field: 'fullUrlBase', message: 'fullUrlBase must be an http(s) URL or a URN with no spaces' });
  }
  if (errors.length > 0) throw new ValidationError(errors);
}

/** The reads of one or more stays as a FHIR R4 collection Bundle of Observations, figures derived afresh by the core. */
export function readsToFhirBundle(input: FhirExportInput, policy: UnitPolicy): FhirExportResult {
  checkRange(input);
  const entry: FhirBundle['entry'] = [];
  const problems: ExportProblem[] = [];
  let readCount = 0;
  const base = input.fullUrlBase?.replace(/\/+$/, '');
  for (const part of input.stays) {
    for (const d of deriveStayReads(part.reads, part.amendments, part.stay, policy)) {
      if (input.fromMs !== undefined && d.stripTimeMs < input.fromMs) continue;
      if (input.toMs !== undefined && d.stripTimeMs >= input.toMs) continue;
      readCount += 1;
      if (!d.analysis) problems.push({ readId: d.view.read.id, stayId: part.stay.id, errors: d.errors });
      for (const resource of observationsOfRead({ d, stay: part.stay, unit: input.unit, input }, policy)) {
        entry.push(base === undefined ? { resource } : { fullUrl: `${base}/Observation/${resource.id}`, resource });
      }
    }
  }
  return { bundle: { resourceType: 'Bundle', type: 'collection', timestamp: isoWithOffset(input.exportedAtMs, input.unit.timeZone), entry }, readCount, problems };
}
