import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import { acknowledgeHandover, giveHandover } from '../../src/core/handover-record.ts';
import type { HandoverInput } from '../../src/core/handover-summary.ts';
import { summarizeHandover } from '../../src/core/handover-summary.ts';
import { shiftAt } from '../../src/core/shifts.ts';
import { defaultPolicy } from '../../src/core/unit-policy.ts';
import { at, berlin, counts, makeAmendment, makeRead, makeStay, ward } from './fixtures/ward-reads.ts';

// Schedule rules (q4h, 30 min grace) are unit policy: common practice, no source. Berlin is UTC+1
// in winter (CET) and UTC+2 in summer (CEST); 2026 changes fall on 29 March and 25 October.

const dayShift = shiftAt(at('2026-03-10T08:00:00Z'), ward.shiftPattern, berlin); // 07:00-19:00 CET = 06:00Z-18:00Z
const nightShift = shiftAt(at('2026-03-10T20:00:00Z'), ward.shiftPattern, berlin);

const beforeShift = makeRead('read-0000000a', '2026-03-10T02:00:00Z', counts.exampleA); // 03:00 CET
const first = makeRead('read-0000000b', '2026-03-10T06:05:00Z', counts.exampleA); // 07:05
const prolonged = makeRead('read-0000000c', '2026-03-10T10:50:00Z', counts.exampleF, {
  reason: 'new-drug',
  notes: 'Escalated to the on-call doctor; repeat strip requested.',
}); // 11:50, 45 min after its 11:05 due time
const irregular = makeRead('read-0000000d', '2026-03-10T14:20:00Z', counts.irregularExampleC, { reason: 'rhythm-change' }); // 15:20
const dayReads = [irregular, prolonged, beforeShift, first];
const stay = makeStay({ baselineQtcMs: 430, qtProlongingDrugs: 'sotalol' });

function input(overrides: Partial<HandoverInput> = {}): HandoverInput {
  return { unit: ward, stay, bedLabel: 'Bed 4', shift: dayShift, reads: dayReads, amendments: [], nowMs: at('2026-03-10T17:30:00Z'), ...overrides };
}

describe('a day shift with four reads, a prolonged QTc and a change to an irregular rhythm', () => {
  const summary = summarizeHandover(input(), defaultPolicy);

  it('counts the reads in the shift and names the last read before it', () => {
    expect(summary.readsInShift).toBe(3);
    expect(summary.readIdsInShift).toEqual(['read-0000000b', 'read-0000000c', 'read-0000000d']);
    expect(summary.lastReadBeforeShiftId).toBe('read-0000000a');
    expect(summary.latestReadId).toBe('read-0000000d');
  });

  it('names the rhythms seen and when they changed', () => {
    expect(summary.rhythms.map((r) => [r.label, r.readIds.length])).toEqual([
      ['Sinus rhythm', 2],
      ['Atrial fibrillation', 1],
    ]);
    expect(summary.rhythmChanges).toEqual([{ atMs: irregular.stripTimeMs, readId: irregular.id, from: 'Sinus rhythm', to: 'Atrial fibrillation' }]);
    expect(summary.assessment).toContain('Rhythm: Sinus rhythm at 07:05; changed to Atrial fibrillation at 15:20.');
  });

  it('names a change from the rhythm of the last read before the shift', () => {
    const changed = summarizeHandover(input({ reads: [beforeShift, irregular] }), defaultPolicy);
    expect(changed.rhythmChanges.map((c) => [c.from, c.to, c.atMs])).toEqual([['Sinus rhythm', 'Atrial fibrillation', irregular.stripTimeMs]]);
    expect(changed.assessment).toContain('Rhythm: Sinus rhythm before the shift; changed to Atrial fibrillation at 15:20.');
  });

  it('gives the rate range: 60 bpm at R-R 1 s to 100 bpm at a mean R-R of 600 ms (60 000 / R-R; Guyton & Hall)', () => {
    expect(summary.rateRangeBpm).toEqual({ min: 60, max: 100 });
    expect(summary.assessment).toContain('Rate 60 to 100 bpm across 3 reads.');
  });

  it('gives PR, QRS and QTc first and last, naming the formula (Fridericia 1920; clinical-reference §4a Ex A and Ex C)', () => {
    expect(summary.figures.prMs).toMatchObject({ first: { value: 160, readId: first.id }, last: { value: 160, readId: prolonged.id }, count: 2 });
    expect(summary.figures.qrsMs).toMatchObject({ first: { value: 80 }, last: { value: 80, readId: irregular.id }, count: 3 });
    expect(summary.figures.qtc?.formula).toBe('fridericia');
    expect(summary.figures.qtc?.first.value).toBeCloseTo(400, 9);
    expect(summary.figures.qtc?.last.value).toBeCloseTo(379.4, 1);
    expect(summary.figures.qtc?.lastApproximate).toBe(true);
    expect(summary.assessment).toContain('QTc by Fridericia (1920) 400 ms at 07:05, 379 ms at 15:20 (down 21 ms); the latest is approximate.');
  });

  it('lists each flag with when it was first seen and whether it is still open on the latest read', () => {
    const byCode = Object.fromEntries(summary.flags.map((f) => [f.code, f]));
    // Ex F: Fridericia 560 ms is >= 500 (Drew et al. 2010; AACN 2016) and 130 ms above the 430 baseline (> 60, Drew et al. 2010).
    expect(byCode['qtc-high-risk']).toMatchObject({ severity: 'urgent', firstSeenMs: prolonged.stripTimeMs, stillOpen: false, raisedInShift: true, presentBeforeShift: false });
    expect(byCode['qtc-rise-from-baseline']?.stillOpen).toBe(false);
    expect(byCode['qtc-rise-since-last-read']?.stillOpen).toBe(false);
    // Ex C: Fridericia 379 ms is at or below 390 (Rautaharju et al. 2009, Part IV).
    expect(byCode['qtc-short']).toMatchObject({ severity: 'caution', stillOpen: true, firstSeenMs: irregular.stripTimeMs });
    expect(summary.flags[0]?.code).toBe('qtc-short');
    expect(summary.assessment.some((l) => l.startsWith('Flag (urgent): QTc (Fridericia) 560 ms is at or above the limit of 500 ms') && l.endsWith('First seen at 11:50; not present on the latest read (15:20).'))).toBe(true);
  });

  it('finds the escalation in the read notes', () => {
    expect(summary.escalations).toEqual([{ atMs: prolonged.stripTimeMs, byName: 'M. Okafor', text: 'Escalated to the on-call doctor; repeat strip requested.', readId: prolonged.id, source: 'read-note' }]);
    expect(summary.assessment).toContain('Escalated at 11:50 by M. Okafor: Escalated to the on-call doctor; repeat strip requested.');
  });

  it('reports reads late against the q4h schedule (common practice, no source)', () => {
    expect(summary.adherence.dueSlots.map((s) => [s.dueMs, s.metByReadMs, s.lateByMs])).toEqual([
      [at('2026-03-10T06:00:00Z'), first.stripTimeMs, 0],
      [at('2026-03-10T10:05:00Z'), prolonged.stripTimeMs, 45 * 60_000],
      [at('2026-03-10T14:50:00Z'), irregular.stripTimeMs, 0],
    ]);
    expect(summary.assessment).toContain('Reads due this shift: 3; 2 on time, 1 late (due 11:05, read 11:50).');
  });

  it('writes situation, background and recommendation in plain sentences', () => {
    expect(summary.situation).toEqual([
      'Bed 4, R.T.: Day shift 2026-03-10 07:00 to 2026-03-10 19:00 (12 h).',
      '3 reads this shift; the latest at 15:20, reason: Rhythm change.',
      'Latest figures: Atrial fibrillation, rate 100 bpm, QTc 379 ms (Fridericia).',
      '1 flag open on the latest read.',
    ]);
    expect(summary.background).toContain('QT-prolonging drugs: sotalol.');
    expect(summary.background).toContain('Patient: female; baseline QTc 430 ms.');
    expect(summary.background).toContain('Last read before this shift, 2026-03-10 03:00: Sinus rhythm, rate 60 bpm, QTc 400 ms (Fridericia).');
    expect(summary.recommendation[0]).toBe('Next read due at 2026-03-10 19:20.');
    expect(summary.recommendation).toContain('The rhythm changed this shift (to Atrial fibrillation at 15:20): compare the next strip with it.');
    expect(summary.recommendation.some((l) => l.startsWith('Recheck QTc (Fridericia): QTc (Fridericia) 379 ms is at or below the limit of 390 ms'))).toBe(true);
    expect(summary.recommendation.some((l) => l.startsWith('Latest QTc: R-R is irregular'))).toBe(true);
  });

  it('carries the decision-support caution', () => {
    expect(summary.cautions.join(' ')).toMatch(/Decision support only/);
    expect(summary.cautions.join(' ')).toMatch(/licensed practice/);
  });

  it('covers the reads it summarised, so later changes can be shown', () => {
    expect(summary.coveredRecordIds).toEqual(['read-0000000a', 'read-0000000b', 'read-0000000c', 'read-0000000d']);
    expect(summary.changedSinceWritten).toBe(false);
  });
});

describe('a bed with no read this shift', () => {
  const summary = summarizeHandover(input({ shift: nightShift, nowMs: at('2026-03-11T05:00:00Z') }), defaultPolicy);

  it('says no read was recorded and that one is overdue', () => {
    expect(summary.readsInShift).toBe(0);
    expect(summary.situation).toContain('No read was recorded this shift.');
    expect(summary.schedule.status).toBe('overdue');
    expect(summary.situation).toContain('A read is overdue: it fell due at 2026-03-10 19:20, 10 h 40 min ago.');
    expect(summary.recommendation[0]).toBe('Take a read now: one is overdue.');
  });

  it('counts each interval without a read as missed, and the one still running as open', () => {
    expect(summary.adherence.missedCount).toBe(2);
    expect(summary.adherence.dueSlots.map((s) => s.missed)).toEqual([true, true, false]);
    expect(summary.assessment).toContain('Reads due this shift: 3; 0 on time, 2 missed (due 19:20, 23:20), 1 still open.');
  });

  it('carries over the flags open on the last read before the shift', () => {
    expect(summary.flags.map((f) => [f.code, f.stillOpen, f.raisedInShift, f.presentBeforeShift])).toEqual([['qtc-short', true, false, true]]);
    expect(summary.situation).toContain('1 flag open on the last read before this shift.');
    expect(summary.rateRangeBpm).toBeNull();
    expect(summary.assessment).toContain('Rhythm: no read this shift.');
  });
});

describe('a stay that started part-way through the shift', () => {
  const lateStay = makeStay({ startMs: at('2026-03-10T09:30:00Z') }); // 10:30 CET
  const admissionRead = makeRead('read-0000001a', '2026-03-10T09:40:00Z', counts.exampleA);
  const secondRead = makeRead('read-0000001b', '2026-03-10T13:30:00Z', counts.exampleA);

  it('counts due reads only from the admission', () => {
    const summary = summarizeHandover(input({ stay: lateStay, reads: [admissionRead, secondRead], nowMs: at('2026-03-10T15:00:00Z') }), defaultPolicy);
    expect(summary.stayStartedInShift).toBe(true);
    expect(summary.adherence.dueSlots.map((s) => [s.dueMs, s.metByReadMs])).toEqual([
      [lateStay.startMs, admissionRead.stripTimeMs],
      [at('2026-03-10T13:40:00Z'), secondRead.stripTimeMs],
    ]);
    expect(summary.situation).toContain('Monitoring began at 10:30, part-way through this shift; reads fell due only from then.');
    expect(summary.background).toContain('No read before this shift.');
  });

  it('shows the first read as overdue when none has been taken since admission', () => {
    const summary = summarizeHandover(input({ stay: lateStay, reads: [], nowMs: at('2026-03-10T10:30:00Z') }), defaultPolicy);
    expect(summary.situation).toContain('No read was recorded this shift.');
    expect(summary.situation).toContain('A read is overdue: it fell due at 2026-03-10 10:30, 1 h ago.');
    expect(summary.adherence.dueSlots).toEqual([{ dueMs: lateStay.startMs, metByReadMs: null, lateByMs: 0, missed: false }]);
  });
});

describe('shifts across a daylight-saving change use their real length', () => {
  const springStay = makeStay({ startMs: at('2026-03-28T10:00:00Z') });
  it('gives an 11 h night when the clocks go forward, with 3 q4h reads due', () => {
    const night = shiftAt(at('2026-03-28T20:00:00Z'), ward.shiftPattern, berlin);
    const reads = ['2026-03-28T14:00:00Z', '2026-03-28T18:00:00Z', '2026-03-28T22:00:00Z', '2026-03-29T02:00:00Z'].map((iso, i) => makeRead(`read-spring-${i}`, iso, counts.exampleA));
    const summary = summarizeHandover(input({ stay: springStay, shift: night, reads, nowMs: at('2026-03-29T05:30:00Z') }), defaultPolicy);
    expect(summary.shiftDurationMs).toBe(11 * 3_600_000);
    expect(summary.clocksChangedInShift).toBe(true);
    expect(summary.situation[0]).toBe('Bed 4, R.T.: Night shift 2026-03-28 19:00 to 2026-03-29 07:00 (11 h; the clocks changed during it).');
    expect(summary.adherence.dueSlots.map((s) => s.lateByMs)).toEqual([0, 0, 0]);
    expect(summary.readsInShift).toBe(3);
    // 02:00 UTC is 04:00 summer time.
    expect(summary.situation).toContain('3 reads this shift; the latest at 04:00, reason: Routine (scheduled).');
  });

  it('gives a 13 h night when the clocks go back, with 4 q4h reads due', () => {
    const autumnStay = makeStay({ startMs: at('2026-10-24T13:00:00Z') });
    const night = shiftAt(at('2026-10-24T20:00:00Z'), ward.shiftPattern, berlin);
    const reads = ['2026-10-24T13:00:00Z', '2026-10-24T17:00:00Z', '2026-10-24T21:00:00Z', '2026-10-25T01:00:00Z', '2026-10-25T05:00:00Z'].map((iso, i) => makeRead(`read-autumn-${i}`, iso, counts.exampleA, { stayId: autumnStay.id }));
    const summary = summarizeHandover(input({ stay: autumnStay, shift: night, reads, nowMs: at('2026-10-25T05:50:00Z') }), defaultPolicy);
    expect(summary.shiftDurationMs).toBe(13 * 3_600_000);
    expect(summary.situation[0]).toBe('Bed 4, R.T.: Night shift 2026-10-24 19:00 to 2026-10-25 07:00 (13 h; the clocks changed during it).');
    expect(summary.readsInShift).toBe(4);
    expect(summary.adherence.dueSlots.map((s) => s.metByReadMs)).toEqual(reads.slice(1).map((r) => r.stripTimeMs));
    expect(summary.adherence.missedCount + summary.adherence.lateCount).toBe(0);
    // 17:00 UTC is 19:00 summer time; 05:00 UTC is 06:00 winter time.
    expect(summary.assessment).toContain('PR 160 ms at 19:00, 160 ms at 06:00.');
  });
});

describe('a read amended after the summary was written', () => {
  const written = summarizeHandover(input(), defaultPolicy);
  // QT recounted as 11 small boxes (440 ms) at R-R 800 ms: Fridericia 474.0 ms (Fridericia 1920 formula, computed).
  const amendment = makeAmendment('amend-0000001', prolonged.id, '2026-03-10T16:00:00Z', { qtSmallBoxes: 11 }, 'Recounted the QT on the monitor: the T-wave end was misread');
  const again = summarizeHandover(input({ amendments: [amendment], writtenSummary: { coveredRecordIds: written.coveredRecordIds } }), defaultPolicy);

  it('shows that the summary changed and names the read', () => {
    expect(again.changedSinceWritten).toBe(true);
    expect(again.changesSinceWritten).toEqual([
      {
        readId: prolonged.id,
        recordIds: ['amend-0000001'],
        kind: 'read-amended',
        sentence: 'The read at 2026-03-10 11:50 was changed after this summary was written: amended at 2026-03-10 17:00 by S. Lindqvist (qtSmallBoxes): Recounted the QT on the monitor: the T-wave end was misread.',
      },
    ]);
    expect(again.situation.some((l) => l.startsWith('Changed since written: The read at 2026-03-10 11:50'))).toBe(true);
    expect(again.recommendation).toContain('Reads changed after this summary was written: review the changes before acknowledging it.');
  });

  it('re-derives the amended read: 474 ms is prolonged for a woman (>= 460, Rautaharju et al. 2009) but not high risk', () => {
    const codes = again.flags.map((f) => f.code);
    expect(codes).toContain('qtc-prolonged');
    expect(codes).not.toContain('qtc-high-risk');
    expect(again.coveredRecordIds).toContain('amend-0000001');
    expect(again.amendmentsCovered.map((a) => a.id)).toEqual(['amend-0000001']);
  });

  it('shows no change when nothing was added after writing', () => {
    const same = summarizeHandover(input({ amendments: [amendment], writtenSummary: { coveredRecordIds: again.coveredRecordIds } }), defaultPolicy);
    expect(same.changedSinceWritten).toBe(false);
  });

  it('names a read entered late into the shift after the summary was written', () => {
    const lateEntry = makeRead('read-0000000e', '2026-03-10T16:30:00Z', counts.exampleA, { reason: 'alarm' });
    const withLate = summarizeHandover(input({ reads: [...dayReads, lateEntry], writtenSummary: { coveredRecordIds: written.coveredRecordIds } }), defaultPolicy);
    expect(withLate.changesSinceWritten.map((c) => [c.readId, c.kind, c.sentence])).toEqual([[lateEntry.id, 'read-added', 'The read at 2026-03-10 17:30 is new since this summary was written.']]);
  });
});

describe('safety wording', () => {
  it('asks for an escalation check when an urgent flag is open and none is recorded', () => {
    const quiet = makeRead('read-0000002a', '2026-03-10T10:50:00Z', counts.exampleF);
    const summary = summarizeHandover(input({ reads: [first, quiet] }), defaultPolicy);
    expect(summary.flags.filter((f) => f.stillOpen && f.severity === 'urgent').map((f) => f.code)).toEqual(['qtc-high-risk', 'qtc-rise-from-baseline', 'qtc-rise-since-last-read']);
    expect(summary.assessment).toContain('Nothing was recorded as escalated this shift.');
    expect(summary.recommendation).toContain("An urgent flag is open and no escalation is recorded this shift: check it has been escalated as your unit's protocol requires.");
  });

  it('counts an escalation recorded outside the notes', () => {
    const quiet = makeRead('read-0000002a', '2026-03-10T10:50:00Z', counts.exampleF);
    const summary = summarizeHandover(input({ reads: [first, quiet], escalations: [{ atMs: at('2026-03-10T11:00:00Z'), byName: 'M. Okafor', text: 'Called the cardiology registrar' }] }), defaultPolicy);
    expect(summary.escalations.map((e) => [e.source, e.text])).toEqual([['recorded', 'Called the cardiology registrar']]);
    expect(summary.recommendation.some((l) => l.startsWith('An urgent flag is open'))).toBe(false);
  });

  it('keeps a read whose stored counts no longer validate, and says why', () => {
    const broken = makeRead('read-0000003a', '2026-03-10T08:00:00Z', { ...counts.exampleA, qtSmallBoxes: 30 });
    const summary = summarizeHandover(input({ reads: [first, broken] }), defaultPolicy);
    expect(summary.readsInShift).toBe(2);
    expect(summary.problems.map((p) => [p.readId, p.errors[0]?.field])).toEqual([[broken.id, 'qtSmallBoxes']]);
    expect(summary.assessment.some((l) => l.startsWith('The read at 09:00 could not be derived: qtSmallBoxes must be between 3 and 25 small boxes at 25 mm/s (120-1000 ms); got 30.'))).toBe(true);
  });
});

describe('edge cases', () => {
  it('refuses an unknown time zone by name', () => {
    expect(() => summarizeHandover(input({ unit: { ...ward, timeZone: 'Mars/Olympus' } }), defaultPolicy)).toThrow(/timeZone "Mars\/Olympus" is not a known IANA time zone/);
  });
  it('refuses a shift that ends before it starts, naming the field', () => {
    try {
      summarizeHandover(input({ shift: { ...dayShift, endMs: dayShift.startMs - 1 } }), defaultPolicy);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      expect((error as ValidationError).errors[0]?.field).toBe('shift.endMs');
    }
  });
  it('refuses a NaN time', () => {
    expect(() => summarizeHandover(input({ nowMs: Number.NaN }), defaultPolicy)).toThrow(/nowMs must be a finite time/);
  });
  it('ignores reads of other stays passed by mistake', () => {
    const other = makeRead('read-other-01', '2026-03-10T08:00:00Z', counts.exampleF, { stayId: 'stay-bed5-0001' });
    expect(summarizeHandover(input({ reads: [...dayReads, other] }), defaultPolicy).readsInShift).toBe(3);
  });
});

describe('the handover record', () => {
  const summary = summarizeHandover(input(), defaultPolicy);
  const given = giveHandover({ id: 'handover-0001', unitId: ward.id, summary, nurseText: 'Family visiting at 20:00.', givenById: 'nurse-00000011', givenByName: 'M. Okafor', givenAtMs: at('2026-03-10T18:00:00Z') });

  it('keeps the giver, the free text, the shift and the covered ids', () => {
    expect(given).toMatchObject({ stayId: stay.id, shiftKey: '2026-03-10/Day', nurseText: 'Family visiting at 20:00.', givenByName: 'M. Okafor', coveredRecordIds: summary.coveredRecordIds });
    expect(given.receivedById).toBeUndefined();
  });

  it('adds the receiving nurse and time, keeping the giver', () => {
    const received = acknowledgeHandover(given, { id: 'nurse-00000021', name: 'T. Haddad' }, at('2026-03-10T18:05:00Z'));
    expect(received).toMatchObject({ givenByName: 'M. Okafor', givenAtMs: at('2026-03-10T18:00:00Z'), receivedByName: 'T. Haddad', receivedAtMs: at('2026-03-10T18:05:00Z') });
    expect(() => acknowledgeHandover(received, { id: 'nurse-00000022', name: 'P. Novak' }, at('2026-03-10T18:06:00Z'))).toThrow(/already acknowledged by T. Haddad/);
  });

  it('refuses an acknowledgement by the giver or before the handover was given', () => {
    expect(() => acknowledgeHandover(given, { id: 'nurse-00000011', name: 'M. Okafor' }, at('2026-03-10T18:05:00Z'))).toThrow(/someone other than/);
    expect(() => acknowledgeHandover(given, { id: 'nurse-00000021', name: 'T. Haddad' }, at('2026-03-10T17:00:00Z'))).toThrow(/receivedAtMs must be at or after/);
  });

  it('refuses free text over 4000 characters, naming the field', () => {
    expect(() => giveHandover({ id: 'handover-0002', unitId: ward.id, summary, nurseText: 'x'.repeat(4001), givenById: 'nurse-00000011', givenByName: 'M. Okafor', givenAtMs: 0 })).toThrow(/nurseText must be at most 4000 characters/);
  });
});
