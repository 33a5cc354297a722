import { describe, expect, it } from 'vitest';
import { analyzeUnknownRead } from '../../src/core/analyze-read.ts';

function questions(raw: Record<string, unknown>) {
  const r = analyzeUnknownRead({ paperSpeedMmPerS: 25, ...raw });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value.questions;
}
const codes = (raw: Record<string, unknown>) => questions(raw).map((q) => q.code);

// Criteria: sinus rate limits from the unit policy (60-100 bpm default, Spodick et al. 1992);
// PR > 200 ms first-degree AV block (Kusumoto et al. 2018); AF irregularly irregular (Hindricks et al. 2020 ESC);
// VT > 100 bpm (Al-Khatib et al. 2017, Table 1); junctional escape 40-60 bpm (common practice, no source).
describe('rhythm cross-checks ask, never diagnose', () => {
  it("asks whether 'sinus rhythm' at 42 bpm is sinus bradycardia", () => {
    const q = questions({ rrSmallBoxes: [35.7], rhythmLabel: 'sinus-rhythm' });
    expect(q).toEqual([{ code: 'sinus-rate-low', question: "Rate 42 bpm with 'Sinus rhythm': is this sinus bradycardia?" }]);
  });
  it("asks whether 'sinus rhythm' at 125 bpm is sinus tachycardia", () => {
    expect(codes({ rrSmallBoxes: [12], rhythmLabel: 'sinus-rhythm' })).toEqual(['sinus-rate-high']);
  });
  it('raises nothing for sinus rhythm at 75 bpm with PR 160 ms', () => {
    expect(codes({ rrSmallBoxes: [20, 20, 20], prSmallBoxes: 4, rhythmLabel: 'sinus-rhythm' })).toEqual([]);
  });
  it('questions sinus bradycardia at 72 bpm and sinus tachycardia at 90 bpm', () => {
    expect(codes({ rrSmallBoxes: [21], rhythmLabel: 'sinus-bradycardia' })).toEqual(['bradycardia-rate-not-low']);
    expect(codes({ rrSmallBoxes: [16.7], rhythmLabel: 'sinus-tachycardia' })).toEqual(['tachycardia-rate-not-high']);
  });
  it('asks about an irregular R-R labelled as a regular rhythm, quoting the spread', () => {
    const q = questions({ rrSmallBoxes: [15, 22, 18, 27], rhythmLabel: 'sinus-rhythm' });
    expect(q.map((x) => x.code)).toEqual(['irregular-with-regular-label']);
    expect(q[0]?.question).toContain('by 480 ms across 4 intervals');
  });
  it('asks about a regular R-R labelled atrial fibrillation (needs at least 3 intervals)', () => {
    expect(codes({ rrSmallBoxes: [20, 20, 20], rhythmLabel: 'atrial-fibrillation' })).toEqual(['regular-with-af']);
    expect(codes({ rrSmallBoxes: [20, 20], rhythmLabel: 'atrial-fibrillation' })).toEqual([]);
  });
  it('asks about PR 240 ms with sinus rhythm and no AV block noted, but not once noted', () => {
    expect(codes({ rrSmallBoxes: [20], prSmallBoxes: 6, rhythmLabel: 'sinus-rhythm' })).toEqual(['long-pr-no-av-block']);
    expect(codes({ rrSmallBoxes: [20], prSmallBoxes: 6, rhythmLabel: 'sinus-rhythm', avBlockNoted: true })).toEqual([]);
  });
  it('questions first-degree AV block with PR 200 ms', () => {
    expect(codes({ rrSmallBoxes: [20], prSmallBoxes: 5, rhythmLabel: 'first-degree-av-block' })).toEqual(['first-degree-pr-not-long']);
  });
  it('questions a PR entered with atrial fibrillation', () => {
    expect(codes({ rrSmallBoxes: [15, 22, 18], prSmallBoxes: 4, rhythmLabel: 'atrial-fibrillation' })).toEqual(['pr-with-af']);
  });
  it('questions VT at 90 bpm and asks about a wide-complex SVT', () => {
    expect(codes({ rrSmallBoxes: [16.7], rhythmLabel: 'ventricular-tachycardia' })).toEqual(['vt-rate-not-fast']);
    expect(codes({ rrSmallBoxes: [8], qrsSmallBoxes: 3.5, qtSmallBoxes: 7, rhythmLabel: 'supraventricular-tachycardia' })).toEqual(['wide-qrs-svt']);
  });
  it('questions complete heart block when the atrial rate is not above the ventricular rate', () => {
    expect(codes({ rrSmallBoxes: [40], ppSmallBoxes: [45], rhythmLabel: 'third-degree-av-block' })).toEqual(['complete-block-rates']);
    expect(codes({ rrSmallBoxes: [40], ppSmallBoxes: [20], rhythmLabel: 'third-degree-av-block' })).toEqual([]);
  });
  it('asks about a paced label for a patient not recorded as paced', () => {
    expect(codes({ rrSmallBoxes: [20], rhythmLabel: 'paced-rhythm' })).toEqual(['paced-label-not-paced']);
    expect(codes({ rrSmallBoxes: [20], rhythmLabel: 'paced-rhythm', paced: true })).toEqual([]);
  });
  it('asks about a junctional rhythm at 75 bpm', () => {
    expect(codes({ rrSmallBoxes: [20], rhythmLabel: 'junctional-rhythm' })).toEqual(['junctional-rate-fast']);
  });
  it('never states a diagnosis: every question ends with a question mark or asks to check', () => {
    const all = [
      ...questions({ rrSmallBoxes: [15, 22, 18, 27], prSmallBoxes: 6, rhythmLabel: 'sinus-rhythm' }),
      ...questions({ rrSmallBoxes: [15, 22, 18], prSmallBoxes: 4, rhythmLabel: 'atrial-fibrillation' }),
    ];
    for (const q of all) expect(q.question).toMatch(/\?$|Check the label|Update the patient/);
  });
});
