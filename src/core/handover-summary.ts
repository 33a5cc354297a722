import type { ReadAnalysis } from './analyze-read.ts';
import { roundForDisplay } from './display-rounding.ts';
import type { FieldError } from './field-error.ts';
import { ValidationError } from './field-error.ts';
import type { Flag, FlagCode } from './read-flags.ts';
import { escalationCaution, sortFlagsBySeverity } from './read-flags.ts';
import type { DueSlot, ScheduleState, ShiftAdherence } from './read-schedule.ts';
import { readScheduleState, shiftReadAdherence } from './read-schedule.ts';
import type { QtcFormula } from './qtc.ts';
import { qtcFormulaNames, qtcFormulaShortNames } from './qtc.ts';
import type { Amendment, SignedRead, Stay, Unit } from './records.ts';
import { readReasonNames } from './records.ts';
import type { RhythmLabelId } from './rhythm-labels.ts';
import { rhythmLabel } from './rhythm-labels.ts';
import type { ShiftInstance } from './shifts.ts';
import type { DerivedRead } from './stay-reads.ts';
import { deriveStayReads } from './stay-reads.ts';
import type { Severity, UnitPolicy } from './unit-policy.ts';
import { localClockText, localDateTimeText, offsetMinutesAt } from './zoned-time-text.ts';

// The handover summary is written as situation, background, assessment and recommendation, in the
// app's own plain wording. Every figure in it is derived afresh by the core from the nurse's counts
// (amendments applied); nothing stored is trusted. Escalation is kept simple: a read whose notes
// mention escalating ("escalated to the on-call doctor") counts as escalated, and callers may pass
// escalations recorded elsewhere.

/** An escalation recorded outside a read's notes (e.g. a call logged on the unit board). */
export interface EscalationNote {
  atMs: number;
  byName: string;
  text: string;
  readId?: string;
}

/** Everything the summary of one stay for one shift is made from. */
export interface HandoverInput {
  unit: Unit;
  stay: Stay;
  bedLabel: string;
  /** From shiftAt/shiftsOverlapping: real start and end instants (11 h or 13 h across a clock change). */
  shift: ShiftInstance;
  /** All reads of the stay, any time: the summary picks those in the shift and the last one before it. */
  reads: readonly SignedRead[];
  amendments: readonly Amendment[];
  escalations?: readonly EscalationNote[];
  nowMs: number;
  /** The ids a written handover covered (Handover.coveredRecordIds), to show what changed since. */
  writtenSummary?: { coveredRecordIds: readonly string[] };
  /** Minutes after a due time a read still counts as on time (the schedule's default when absent). */
  graceMinutes?: number;
}

/** A run of reads naming the same rhythm. */
export interface RhythmSpan {
  /** Label name, with the nurse's free text after a colon, or 'rhythm not named'. */
  label: string;
  rhythmLabelId: RhythmLabelId | null;
  fromMs: number;
  toMs: number;
  readIds: string[];
}

/** A change of named rhythm between two consecutive reads (the first may be the last read before the shift). */
export interface RhythmChange {
  atMs: number;
  readId: string;
  from: string;
  to: string;
}

/** One figure at one read. */
export interface FigureAt {
  value: number;
  readId: string;
  stripTimeMs: number;
}

/** The first and last value of a figure in the shift, and how many reads measured it. */
export interface FirstAndLast {
  first: FigureAt;
  last: FigureAt;
  count: number;
}

/** QTc first and last by the unit's default formula, named, plus the value the last read's limits used. */
export interface QtcFirstAndLast extends FirstAndLast {
  formula: QtcFormula;
  formulaName: string;
  lastForLimitsMs: number;
  lastBasis: 'plain' | 'modified-qt';
  lastApproximate: boolean;
}

/** A flag seen in the shift (or carried over when the shift has no read), and whether it is still open. */
export interface HandoverFlag {
  code: FlagCode;
  severity: Severity;
  figure: string;
  firstSeenMs: number;
  lastSeenMs: number;
  readIds: string[];
  /** Present on the latest read of the shift (or, with no read this shift, on the last read before it). */
  stillOpen: boolean;
  presentBeforeShift: boolean;
  raisedInShift: boolean;
  /** The most recent occurrence: value, limit, source and sentence. */
  latest: Flag;
}

/** An escalation found in a read's notes or passed in. */
export interface HandoverEscalation {
  atMs: number;
  byName: string;
  text: string;
  readId: string | null;
  source: 'read-note' | 'recorded';
}

/** A read that is new, or amended, since the written summary. */
export interface ChangeSinceWritten {
  readId: string;
  recordIds: string[];
  kind: 'read-added' | 'read-amended';
  sentence: string;
}

/** A read in the shift whose stored counts could not be derived; its counts are kept, never dropped. */
export interface ReadProblem {
  readId: string;
  stripTimeMs: number;
  errors: FieldError[];
}

/** The generated handover summary for one stay and one shift. */
export interface HandoverSummary {
  stayId: string;
  bedLabel: string;
  alias: string;
  shiftKey: string;
  shiftName: string;
  shiftStartMs: number;
  shiftEndMs: number;
  shiftDurationMs: number;
  clocksChangedInShift: boolean;
  stayStartedInShift: boolean;
  stayEndedInShift: boolean;
  situation: string[];
  background: string[];
  assessment: string[];
  recommendation: string[];
  rhythms: RhythmSpan[];
  rhythmChanges: RhythmChange[];
  rateRangeBpm: { min: number; max: number } | null;
  figures: { prMs: FirstAndLast | null; qrsMs: FirstAndLast | null; qtc: QtcFirstAndLast | null };
  flags: HandoverFlag[];
  escalations: HandoverEscalation[];
  readsInShift: number;
  readIdsInShift: string[];
  lastReadBeforeShiftId: string | null;
  latestReadId: string | null;
  adherence: ShiftAdherence;
  schedule: ScheduleState;
  amendmentsCovered: Amendment[];
  problems: ReadProblem[];
  changedSinceWritten: boolean;
  changesSinceWritten: ChangeSinceWritten[];
  /** Read and amendment ids this summary covers; store them in Handover.coveredRecordIds. */
  coveredRecordIds: string[];
  cautions: string[];
}

/** Wording of the decision-support caution every summary carries. */
export const handoverCautions = [
  'Decision support only: every figure is arithmetic on the box counts entered. Verify rate, intervals and rhythm on the monitor and the strip before acting.',
  "Limits are this unit's configurable settings; your unit's protocol and your licensed practice govern escalation.",
] as const;

/** Read notes that mention escalating count as an escalation (simple rule, stated in the README). */
const escalationWords = /\bescalat/i;

const minuteMs = 60_000;

function durationText(ms: number): string {
  const totalMinutes = Math.round(ms / minuteMs);
  const hours = Math.floor(totalMinutes / 60);
  const minutes = totalMinutes % 60;
  if (hours === 0) return `${minutes} min`;
  return minutes === 0 ? `${hours} h` : `${hours} h ${minutes} min`;
}

function checkInput(input: HandoverInput): void {
  const errors: FieldError[] = [];
  const finite = (field: string, value: number) => {
    if (!Number.isFinite(value)) errors.push({ field, message: `${field} must be a finite time in epoch milliseconds` });
  };
  finite('shift.startMs', input.shift.startMs);
  finite('shift.endMs', input.shift.endMs);
  finite('nowMs', input.nowMs);
  if (errors.length === 0 && input.shift.endMs <= input.shift.startMs) {
    errors.push({ field: 'shift.endMs', message: 'shift.endMs must be after shift.startMs' });
  }
  if (errors.length > 0) throw new ValidationError(errors);
  // Refuses an unknown time zone by name before any text is written.
  offsetMinutesAt(input.shift.startMs, input.unit.timeZone);
}

function rhythmOf(read: SignedRead): { label: string; id: RhythmLabelId | null } {
  const id = read.counts.rhythmLabel ?? null;
  const text = read.rhythmText?.trim() ?? '';
  if (id === null) return { label: text === '' ? 'rhythm not named' : text, id };
  const name = rhythmLabel(id).name;
  return { label: text === '' ? name : `${name}: ${text}`, id };
}

function withoutCaution(sentence: string): string {
  return sentence.replace(` ${escalationCaution}`, '').trim();
}

function show(value: number, unit: string): string {
  return `${roundForDisplay(value)} ${unit}`;
}

function firstAndLast(points: FigureAt[]): FirstAndLast | null {
  const first = points[0];
  const last = points[points.length - 1];
  return first && last ? { first, last, count: points.length } : null;
}

/** The handover summary of one stay for one shift, in situation / background / assessment / recommendation order. */
export function summarizeHandover(input: HandoverInput, policy: UnitPolicy): HandoverSummary {
  checkInput(input);
  const { unit, stay, shift, nowMs } = input;
  const zone = unit.timeZone;
  // Times inside the shift read as HH:mm; anything outside it carries its date.
  const when = (ms: number): string => (ms >= shift.startMs && ms <= shift.endMs ? localClockText(ms, zone) : localDateTimeText(ms, zone));

  const derived = deriveStayReads(input.reads, input.amendments, stay, policy);
  const inShift = derived.filter((d) => d.stripTimeMs >= shift.startMs && d.stripTimeMs < shift.endMs);
  const before = derived.filter((d) => d.stripTimeMs < shift.startMs);
  const lastBefore = before[before.length - 1] ?? null;
  const analysed = inShift.filter((d): d is DerivedRead & { analysis: ReadAnalysis } => d.analysis !== null);
  const latest = analysed[analysed.length - 1] ?? null;
  const latestAnyInShift = inShift[inShift.length - 1] ?? null;
  const formula = policy.defaultQtcFormula;

  // Rhythm spans and changes, starting from the last read before the shift.
  const rhythms: RhythmSpan[] = [];
  const rhythmChanges: RhythmChange[] = [];
  let previousRhythm = lastBefore ? rhythmOf(lastBefore.view.current).label : null;
  for (const d of inShift) {
    const { label, id } = rhythmOf(d.view.current);
    const span = rhythms[rhythms.length - 1];
    if (span && span.label === label) {
      span.toMs = d.stripTimeMs;
      span.readIds.push(d.view.read.id);
    } else {
      rhythms.push({ label, rhythmLabelId: id, fromMs: d.stripTimeMs, toMs: d.stripTimeMs, readIds: [d.view.read.id] });
    }
    if (previousRhythm !== null && previousRhythm !== label) rhythmChanges.push({ atMs: d.stripTimeMs, readId: d.view.read.id, from: previousRhythm, to: label });
    previousRhythm = label;
  }

  // Figures.
  const rates = analysed.map((d) => d.analysis.rate.rateBpm);
  const rateRangeBpm = rates.length > 0 ? { min: Math.min(...rates), max: Math.max(...rates) } : null;
  const pointsOf = (pick: (a: ReadAnalysis) => number | null): FigureAt[] =>
    analysed.flatMap((d) => {
      const value = pick(d.analysis);
      return value === null ? [] : [{ value, readId: d.view.read.id, stripTimeMs: d.stripTimeMs }];
    });
  const prMs = firstAndLast(pointsOf((a) => a.intervals.prMs));
  const qrsMs = firstAndLast(pointsOf((a) => a.intervals.qrsMs));
  const qtcPoints = firstAndLast(pointsOf((a) => a.qtc?.byFormula[formula] ?? null));
  let qtc: QtcFirstAndLast | null = null;
  if (qtcPoints) {
    const lastQtc = analysed.find((d) => d.view.read.id === qtcPoints.last.readId)!.analysis.qtc!;
    qtc = { ...qtcPoints, formula, formulaName: qtcFormulaNames[formula], lastForLimitsMs: lastQtc.forFlags.qtcMs, lastBasis: lastQtc.forFlags.basis, lastApproximate: lastQtc.approximate };
  }

  // Flags: raised in the shift, or carried over from the last read before it when the shift has none.
  const beforeCodes = new Set(lastBefore?.analysis?.flags.map((f) => f.code) ?? []);
  const flagMap = new Map<FlagCode, HandoverFlag>();
  const flagSources = analysed.length > 0 ? analysed : lastBefore?.analysis ? [lastBefore as DerivedRead & { analysis: ReadAnalysis }] : [];
  const latestForOpen = flagSources[flagSources.length - 1] ?? null;
  const openCodes = new Set(latestForOpen?.analysis.flags.map((f) => f.code) ?? []);
  for (const d of flagSources) {
    for (const flag of d.analysis.flags) {
      const entry = flagMap.get(flag.code);
      if (entry) {
        entry.lastSeenMs = d.stripTimeMs;
        entry.readIds.push(d.view.read.id);
        entry.latest = flag;
        entry.severity = flag.severity;
      } else {
        flagMap.set(flag.code, {
          code: flag.code,
          severity: flag.severity,
          figure: flag.figure,
          firstSeenMs: d.stripTimeMs,
          lastSeenMs: d.stripTimeMs,
          readIds: [d.view.read.id],
          stillOpen: openCodes.has(flag.code),
          presentBeforeShift: beforeCodes.has(flag.code),
          raisedInShift: analysed.length > 0,
          latest: flag,
        });
      }
    }
  }
  const flags = sortFlagsBySeverity([...flagMap.values()]).sort((a, b) => Number(b.stillOpen) - Number(a.stillOpen));

  // Escalations: read notes that say so, plus any recorded elsewhere during the shift.
  const escalations: HandoverEscalation[] = [];
  for (const d of inShift) {
    const notes = d.view.current.notes ?? '';
    if (escalationWords.test(notes)) escalations.push({ atMs: d.stripTimeMs, byName: d.view.read.authorName, text: notes.trim(), readId: d.view.read.id, source: 'read-note' });
  }
  for (const e of input.escalations ?? []) {
    if (e.atMs >= shift.startMs && e.atMs < shift.endMs) escalations.push({ atMs: e.atMs, byName: e.byName, text: e.text.trim(), readId: e.readId ?? null, source: 'recorded' });
  }
  escalations.sort((a, b) => a.atMs - b.atMs);

  // Schedule: due times in the shift (only from the stay start), and where the stay stands now.
  const readTimesMs = derived.map((d) => d.stripTimeMs);
  const adherenceInput = { stayStartMs: stay.startMs, stayEndMs: stay.endMs, readTimesMs, intervalHours: unit.readIntervalHours, shiftStartMs: shift.startMs, shiftEndMs: shift.endMs, nowMs };
  const adherence = shiftReadAdherence(input.graceMinutes === undefined ? adherenceInput : { ...adherenceInput, graceMinutes: input.graceMinutes });
  const schedule = readScheduleState({ stayStartMs: stay.startMs, stayEndMs: stay.endMs, readTimesMs, intervalHours: unit.readIntervalHours, nowMs });

  // What this summary covers, and what changed since a written one.
  const covered = lastBefore ? [lastBefore, ...inShift] : inShift;
  const amendmentsCovered = covered.flatMap((d) => d.view.amendments).sort((a, b) => a.createdAtMs - b.createdAtMs || a.id.localeCompare(b.id));
  const coveredRecordIds = [...new Set([...covered.map((d) => d.view.read.id), ...amendmentsCovered.map((a) => a.id)])].sort();
  const changesSinceWritten: ChangeSinceWritten[] = [];
  if (input.writtenSummary) {
    const written = new Set(input.writtenSummary.coveredRecordIds);
    for (const d of covered) {
      const newAmendments = d.view.amendments.filter((a) => !written.has(a.id));
      const readIsNew = !written.has(d.view.read.id);
      if (!readIsNew && newAmendments.length === 0) continue;
      const amendedText = newAmendments
        .map((a) => `amended at ${localDateTimeText(a.createdAtMs, zone)} by ${a.authorName} (${Object.keys(a.changes).join(', ')}): ${a.reason}`)
        .join('; ');
      const readName = `The read at ${localDateTimeText(d.stripTimeMs, zone)}`;
      const sentence = readIsNew
        ? `${readName} is new since this summary was written${amendedText ? `; ${amendedText}` : ''}.`
        : `${readName} was changed after this summary was written: ${amendedText}.`;
      changesSinceWritten.push({ readId: d.view.read.id, recordIds: [...(readIsNew ? [d.view.read.id] : []), ...newAmendments.map((a) => a.id)], kind: readIsNew ? 'read-added' : 'read-amended', sentence });
    }
  }

  const problems: ReadProblem[] = inShift.filter((d) => d.analysis === null).map((d) => ({ readId: d.view.read.id, stripTimeMs: d.stripTimeMs, errors: d.errors }));

  // Shift facts.
  const clocksChangedInShift = offsetMinutesAt(shift.startMs, zone) !== offsetMinutesAt(shift.endMs, zone);
  const stayStartedInShift = stay.startMs > shift.startMs && stay.startMs < shift.endMs;
  const stayEndedInShift = stay.endMs !== null && stay.endMs >= shift.startMs && stay.endMs < shift.endMs;

  const figuresText = (d: DerivedRead & { analysis: ReadAnalysis }): string => {
    const parts = [rhythmOf(d.view.current).label, `rate ${show(d.analysis.rate.rateBpm, 'bpm')}`];
    if (d.analysis.qtc) parts.push(`QTc ${show(d.analysis.qtc.byFormula[formula], 'ms')} (${qtcFormulaShortNames[formula]})`);
    return parts.join(', ');
  };

  // Situation.
  const situation: string[] = [];
  const clockNote = clocksChangedInShift ? '; the clocks changed during it' : '';
  situation.push(
    `${input.bedLabel}, ${stay.alias}: ${shift.name} shift ${localDateTimeText(shift.startMs, zone)} to ${localDateTimeText(shift.endMs, zone)} (${durationText(shift.durationMs)}${clockNote}).`,
  );
  if (stay.startMs >= shift.endMs) situation.push(`Monitoring began after this shift, at ${localDateTimeText(stay.startMs, zone)}.`);
  else if (stayStartedInShift) situation.push(`Monitoring began at ${when(stay.startMs)}, part-way through this shift; reads fell due only from then.`);
  if (stay.endMs !== null && stay.endMs < shift.startMs) situation.push(`Monitoring ended before this shift, at ${localDateTimeText(stay.endMs, zone)}.`);
  else if (stayEndedInShift && stay.endMs !== null) situation.push(`Monitoring ended at ${when(stay.endMs)}.`);
  if (inShift.length === 0) {
    situation.push('No read was recorded this shift.');
  } else {
    const newest = latestAnyInShift!;
    situation.push(`${inShift.length} ${inShift.length === 1 ? 'read' : 'reads'} this shift; the latest at ${when(newest.stripTimeMs)}, reason: ${readReasonNames[newest.view.current.reason]}.`);
    if (latest) situation.push(`Latest figures: ${figuresText(latest)}.`);
  }
  if (schedule.status === 'overdue' && schedule.nextDueMs !== null) {
    situation.push(`A read is overdue: it fell due at ${localDateTimeText(schedule.nextDueMs, zone)}, ${durationText(schedule.overdueByMs)} ago.`);
  }
  const openFlags = flags.filter((f) => f.stillOpen);
  const openUrgent = openFlags.filter((f) => f.severity === 'urgent').length;
  if (openFlags.length > 0) {
    const whereOpen = analysed.length > 0 ? 'on the latest read' : 'on the last read before this shift';
    situation.push(`${openFlags.length} ${openFlags.length === 1 ? 'flag' : 'flags'} open ${whereOpen}${openUrgent > 0 ? `, ${openUrgent} urgent` : ''}.`);
  } else if (analysed.length > 0) {
    situation.push('No flag open on the latest read.');
  }
  for (const change of changesSinceWritten) situation.push(`Changed since written: ${change.sentence}`);

  // Background.
  const background: string[] = [];
  background.push(`Monitored since ${localDateTimeText(stay.startMs, zone)}.`);
  const details: string[] = [];
  if (stay.sex !== 'unknown') details.push(stay.sex);
  else details.push('sex not recorded (the lower QTc limit is used)');
  if (stay.ageYears !== undefined) details.push(`${stay.ageYears} years`);
  else if (stay.ageBand !== undefined) details.push(`age ${stay.ageBand}`);
  if (stay.paced) details.push('paced');
  if (stay.bundleBranchBlock) details.push('bundle-branch block');
  if (stay.baselineQtcMs !== undefined) details.push(`baseline QTc ${show(stay.baselineQtcMs, 'ms')}`);
  background.push(`Patient: ${details.join('; ')}.`);
  if (stay.qtProlongingDrugs.trim() !== '') background.push(`QT-prolonging drugs: ${stay.qtProlongingDrugs.trim()}.`);
  if (stay.notes.trim() !== '') background.push(`Stay notes: ${stay.notes.trim()}`);
  if (lastBefore?.analysis) {
    background.push(`Last read before this shift, ${localDateTimeText(lastBefore.stripTimeMs, zone)}: ${figuresText(lastBefore as DerivedRead & { analysis: ReadAnalysis })}.`);
  } else if (lastBefore) {
    background.push(`Last read before this shift, ${localDateTimeText(lastBefore.stripTimeMs, zone)}: its counts could not be derived (${lastBefore.errors.map((e) => e.message).join('; ')}).`);
  } else {
    background.push('No read before this shift.');
  }

  // Assessment.
  const assessment: string[] = [];
  if (rhythms.length === 0) {
    assessment.push('Rhythm: no read this shift.');
  } else if (rhythms.length === 1 && rhythmChanges.length === 0) {
    assessment.push(`Rhythm: ${rhythms[0]!.label} throughout (${rhythms[0]!.readIds.length} ${rhythms[0]!.readIds.length === 1 ? 'read' : 'reads'}).`);
  } else {
    const steps = rhythms.map((span, i) => `${i === 0 && rhythmChanges[0]?.atMs !== span.fromMs ? '' : 'changed to '}${span.label} at ${when(span.fromMs)}`);
    const from = rhythmChanges[0]?.atMs === rhythms[0]?.fromMs ? `${rhythmChanges[0]!.from} before the shift; ` : '';
    assessment.push(`Rhythm: ${from}${steps.join('; ')}.`);
  }
  if (rateRangeBpm) {
    assessment.push(
      rates.length === 1
        ? `Rate ${show(rateRangeBpm.min, 'bpm')} (one read).`
        : `Rate ${roundForDisplay(rateRangeBpm.min)} to ${show(rateRangeBpm.max, 'bpm')} across ${rates.length} reads.`,
    );
  }
  const intervalLine = (name: string, fl: FirstAndLast | null): string => {
    if (!fl) return `${name} not measured this shift.`;
    if (fl.count === 1) return `${name} ${show(fl.first.value, 'ms')} at ${when(fl.first.stripTimeMs)} (one read).`;
    return `${name} ${show(fl.first.value, 'ms')} at ${when(fl.first.stripTimeMs)}, ${show(fl.last.value, 'ms')} at ${when(fl.last.stripTimeMs)}.`;
  };
  if (analysed.length > 0) {
    assessment.push(intervalLine('PR', prMs));
    assessment.push(intervalLine('QRS', qrsMs));
    if (qtc) {
      const change = qtc.count > 1 ? roundForDisplay(qtc.last.value) - roundForDisplay(qtc.first.value) : 0;
      const changeText = qtc.count > 1 ? ` (${change > 0 ? `up ${change}` : change < 0 ? `down ${-change}` : 'no change'}${change === 0 ? '' : ' ms'})` : '';
      const base = intervalLine(`QTc by ${qtc.formulaName}`, qtc).replace(/\.$/, '');
      const adjusted = qtc.lastBasis === 'modified-qt' ? `; with the wide QRS, limits were compared with the adjusted QTc ${show(qtc.lastForLimitsMs, 'ms')} (QT - 0.5 x QRS, Bogossian et al. 2014)` : '';
      const approximate = qtc.lastApproximate ? '; the latest is approximate' : '';
      assessment.push(`${base}${changeText}${adjusted}${approximate}.`);
    } else {
      assessment.push('QT not measured this shift, so no QTc.');
    }
  }
  for (const flag of flags) {
    const status = flag.stillOpen
      ? analysed.length > 0
        ? 'still open on the latest read'
        : 'open on the last read before this shift'
      : `not present on the latest read (${when(latestForOpen!.stripTimeMs)})`;
    const carried = flag.presentBeforeShift ? 'already present before the shift' : `first seen at ${when(flag.firstSeenMs)}`;
    assessment.push(`Flag (${flag.severity}): ${withoutCaution(flag.latest.sentence)} ${carried[0]!.toUpperCase()}${carried.slice(1)}; ${status}.`);
  }
  if (latest) {
    for (const q of latest.analysis.questions) assessment.push(`Question on the latest read: ${q.question}`);
  }
  if (escalations.length === 0) assessment.push('Nothing was recorded as escalated this shift.');
  for (const e of escalations) assessment.push(`Escalated at ${when(e.atMs)} by ${e.byName}: ${e.text}`);
  for (const a of amendmentsCovered) {
    const read = covered.find((d) => d.view.read.id === a.readId)!;
    assessment.push(`The read at ${when(read.stripTimeMs)} was amended at ${when(a.createdAtMs)} by ${a.authorName} (${Object.keys(a.changes).join(', ')}): ${a.reason}`);
  }
  for (const d of inShift) {
    const notes = d.view.current.notes?.trim() ?? '';
    if (notes !== '' && !escalationWords.test(notes)) assessment.push(`Note on the ${when(d.stripTimeMs)} read: ${notes}`);
  }
  assessment.push(adherenceLine(adherence.dueSlots, when, unit.readIntervalHours));
  for (const p of problems) {
    assessment.push(`The read at ${when(p.stripTimeMs)} could not be derived: ${p.errors.map((e) => e.message).join('; ')}. Its counts are kept; amend them to see its figures.`);
  }

  // Recommendation: what to watch next shift.
  const recommendation: string[] = [];
  if (schedule.status === 'overdue') recommendation.push('Take a read now: one is overdue.');
  else if (schedule.nextDueMs !== null && schedule.status !== 'ended') recommendation.push(`Next read due at ${localDateTimeText(schedule.nextDueMs, zone)}.`);
  for (const flag of openFlags) {
    recommendation.push(`Recheck ${flag.figure}: ${withoutCaution(flag.latest.sentence)}`);
  }
  if (openUrgent > 0 && escalations.length === 0) {
    recommendation.push("An urgent flag is open and no escalation is recorded this shift: check it has been escalated as your unit's protocol requires.");
  }
  const lastChange = rhythmChanges[rhythmChanges.length - 1];
  if (lastChange) recommendation.push(`The rhythm changed this shift (to ${lastChange.to} at ${when(lastChange.atMs)}): compare the next strip with it.`);
  if (latest?.analysis.qtc) {
    for (const w of latest.analysis.qtc.warnings) recommendation.push(`Latest QTc: ${w.message}`);
  }
  if (latest && latest.analysis.questions.length > 0) recommendation.push('Settle the open rhythm question on the latest read (see assessment).');
  if (adherence.missedCount > 0) recommendation.push(`${adherence.missedCount} due ${adherence.missedCount === 1 ? 'read was' : 'reads were'} missed this shift: keep to reads every ${unit.readIntervalHours} h.`);
  if (problems.length > 0) recommendation.push('Correct the counts of the read(s) that could not be derived.');
  if (changesSinceWritten.length > 0) recommendation.push('Reads changed after this summary was written: review the changes before acknowledging it.');
  if (openFlags.length === 0 && analysed.length > 0) recommendation.push(`No flag open on the latest read: continue reads every ${unit.readIntervalHours} h.`);

  const cautions: string[] = [...handoverCautions, `Flags end with: ${escalationCaution}`];

  return {
    stayId: stay.id,
    bedLabel: input.bedLabel,
    alias: stay.alias,
    shiftKey: shift.key,
    shiftName: shift.name,
    shiftStartMs: shift.startMs,
    shiftEndMs: shift.endMs,
    shiftDurationMs: shift.durationMs,
    clocksChangedInShift,
    stayStartedInShift,
    stayEndedInShift,
    situation,
    background,
    assessment,
    recommendation,
    rhythms,
    rhythmChanges,
    rateRangeBpm,
    figures: { prMs, qrsMs, qtc },
    flags,
    escalations,
    readsInShift: inShift.length,
    readIdsInShift: inShift.map((d) => d.view.read.id),
    lastReadBeforeShiftId: lastBefore?.view.read.id ?? null,
    latestReadId: latestAnyInShift?.view.read.id ?? null,
    adherence,
    schedule,
    amendmentsCovered,
    problems,
    changedSinceWritten: changesSinceWritten.length > 0,
    changesSinceWritten,
    coveredRecordIds,
    cautions,
  };
}

function adherenceLine(slots: DueSlot[], when: (ms: number) => string, intervalHours: number): string {
  if (slots.length === 0) return `No read fell due this shift on the every-${intervalHours}-h schedule.`;
  const onTime = slots.filter((s) => s.metByReadMs !== null && s.lateByMs === 0).length;
  const open = slots.filter((s) => s.metByReadMs === null && !s.missed).length;
  const parts = [`${onTime} on time`];
  const late = slots.filter((s) => s.lateByMs > 0);
  if (late.length > 0) parts.push(`${late.length} late (${late.map((s) => `due ${when(s.dueMs)}, read ${when(s.metByReadMs!)}`).join('; ')})`);
  const missed = slots.filter((s) => s.missed);
  if (missed.length > 0) parts.push(`${missed.length} missed (due ${missed.map((s) => when(s.dueMs)).join(', ')})`);
  if (open > 0) parts.push(`${open} still open`);
  return `Reads due this shift: ${slots.length}; ${parts.join(', ')}.`;
}
