/** The QT correction formulas the app offers; the unit policy names the default. */
export const qtcFormulas = ['bazett', 'fridericia', 'framingham', 'hodges'] as const;
export type QtcFormula = (typeof qtcFormulas)[number];

/** Display names, with the year of publication, for banners, tables and exports. */
export const qtcFormulaNames: Record<QtcFormula, string> = {
  bazett: 'Bazett (1920)',
  fridericia: 'Fridericia (1920)',
  framingham: 'Framingham (Sagie 1992)',
  hodges: 'Hodges (1983)',
};

/** Short names for figure labels ("QTc (Fridericia)"). */
export const qtcFormulaShortNames: Record<QtcFormula, string> = {
  bazett: 'Bazett',
  fridericia: 'Fridericia',
  framingham: 'Framingham',
  hodges: 'Hodges',
};

/** Bazett 1920: QTc = QT / RR^(1/2), RR in seconds. */
export function qtcBazett(qtMs: number, rrMs: number): number {
  return qtMs / Math.sqrt(rrMs / 1000);
}

/** Fridericia 1920: QTc = QT / RR^(1/3) with the exponent exactly one third (not 0.33). */
export function qtcFridericia(qtMs: number, rrMs: number): number {
  return qtMs / Math.cbrt(rrMs / 1000);
}

/** Framingham, Sagie et al. 1992: QTc(ms) = QT(ms) + 154 x (1 - RR(s)). */
export function qtcFramingham(qtMs: number, rrMs: number): number {
  return qtMs + 154 * (1 - rrMs / 1000);
}

/** Hodges et al. 1983: QTc(ms) = QT(ms) + 1.75 x (HR - 60), HR taken from the same R-R. */
export function qtcHodges(qtMs: number, rrMs: number): number {
  return qtMs + 1.75 * (60_000 / rrMs - 60);
}

const byFormula: Record<QtcFormula, (qtMs: number, rrMs: number) => number> = {
  bazett: qtcBazett,
  fridericia: qtcFridericia,
  framingham: qtcFramingham,
  hodges: qtcHodges,
};

/** QTc in ms by the named formula. */
export function correctQt(formula: QtcFormula, qtMs: number, rrMs: number): number {
  return byFormula[formula](qtMs, rrMs);
}

/** QTc by every formula, keyed by formula. */
export function correctQtAllFormulas(qtMs: number, rrMs: number): Record<QtcFormula, number> {
  return {
    bazett: qtcBazett(qtMs, rrMs),
    fridericia: qtcFridericia(qtMs, rrMs),
    framingham: qtcFramingham(qtMs, rrMs),
    hodges: qtcHodges(qtMs, rrMs),
  };
}

/** JT interval: QT - QRS, the repolarisation time left when the QRS is wide (Bogossian et al. 2020 review). */
export function jtMs(qtMs: number, qrsMs: number): number {
  return qtMs - qrsMs;
}

/** Bogossian et al. 2014 modified QT for wide QRS, simplified form: QT - 0.5 x QRS, then rate-corrected as usual. */
export function bogossianModifiedQtMs(qtMs: number, qrsMs: number): number {
  return qtMs - 0.5 * qrsMs;
}
