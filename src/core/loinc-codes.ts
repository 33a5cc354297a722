import type { QtcFormula } from './qtc.ts';

// Codes for the FHIR export, each with the row of ../shared/clinical-reference.md (§6) that confirms it.
// Interval decision: the per-lead LOINC codes (44976-9, 44973-6, 44975-1) are confirmed by the US Core
// EKG examples, while the global codes (8625-6, 8633-0, 8634-8) are only 'partial' there and could not
// be checked against the LOINC record, so the export uses the per-lead codes. A ward read is a hand
// measurement on one monitor lead, which is what the per-lead codes describe; the read record does not
// yet carry the lead's name, so the export says so in the Observation's method rather than guessing it.

/** LOINC code system URI. */
export const loincSystem = 'http://loinc.org';
/** UCUM code system URI (FHIR R4 heart-rate profile, clinical-reference §6d). */
export const ucumSystem = 'http://unitsofmeasure.org';
/** FHIR observation-category code system (clinical-reference §6e row 6.1). */
export const observationCategorySystem = 'http://terminology.hl7.org/CodeSystem/observation-category';
/** HL7 v3 ObservationInterpretation code system (clinical-reference §6e row 6.5). */
export const interpretationSystem = 'http://terminology.hl7.org/CodeSystem/v3-ObservationInterpretation';
/** FHIR data-absent-reason code system, for a read whose counts could not be derived. */
export const dataAbsentReasonSystem = 'http://terminology.hl7.org/CodeSystem/data-absent-reason';
/** FHIR administrative-gender code system, for sex-specific reference ranges. */
export const administrativeGenderSystem = 'http://hl7.org/fhir/administrative-gender';

/** FHIR R4 core profiles a heart-rate Observation declares (clinical-reference §6e rows 6.1-6.2). */
export const vitalSignsProfile = 'http://hl7.org/fhir/StructureDefinition/vitalsigns';
export const heartRateProfile = 'http://hl7.org/fhir/StructureDefinition/heartrate';

/** One LOINC code with its LOINC name and where the project confirmed it. */
export interface LoincCode {
  code: string;
  display: string;
  /** The clinical-reference row and how far it is confirmed. */
  reference: string;
}

/** The LOINC codes the export uses. */
export const loincCodes = {
  heartRate: { code: '8867-4', display: 'Heart rate', reference: 'clinical-reference §6a 8867-4: confirmed (FHIR R4 heart-rate profile)' },
  prIntervalLead: { code: '44976-9', display: 'P-R interval {EKG lead}', reference: 'clinical-reference §6a 44976-9: confirmed (US Core EKG example)' },
  qrsDurationLead: { code: '44973-6', display: 'QRS duration {EKG lead}', reference: 'clinical-reference §6a 44973-6: confirmed (US Core EKG example)' },
  qtIntervalLead: { code: '44975-1', display: 'Q-T interval {EKG lead}', reference: 'clinical-reference §6a 44975-1: confirmed (US Core EKG example)' },
  qtcBazett: { code: '76635-2', display: 'Q-T interval corrected based on Bazett formula', reference: 'clinical-reference §6a 76635-2: confirmed' },
  qtcFridericia: { code: '76634-5', display: 'Q-T interval corrected based on Fridericia formula', reference: 'clinical-reference §6a 76634-5: confirmed' },
  qtcMethodNotSpecified: { code: '8636-3', display: 'Q-T interval corrected', reference: 'clinical-reference §6a 8636-3: confirmed (method not specified, so the method is stated separately)' },
  ekgImpression: { code: '8601-7', display: 'EKG impression', reference: 'clinical-reference §6a 8601-7: confirmed (US Core EKG example)' },
  heartRateRhythm: { code: '8884-9', display: 'Heart rate rhythm', reference: 'clinical-reference §6a 8884-9: confirmed (US Core cardiology example)' },
} as const satisfies Record<string, LoincCode>;

/**
 * The QTc code for a formula: the formula-specific LOINC code where one is confirmed (Bazett, Fridericia),
 * otherwise 'QTc, method not specified' (the export then names the formula in Observation.method).
 */
export function qtcLoincCode(formula: QtcFormula): LoincCode {
  if (formula === 'bazett') return loincCodes.qtcBazett;
  if (formula === 'fridericia') return loincCodes.qtcFridericia;
  return loincCodes.qtcMethodNotSpecified;
}
