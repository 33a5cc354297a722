/** Allowed recording speeds in mm/s (Kligfield et al. 2007, Part I: 25 mm/s standard; 50 mm/s fast paper). */
export const paperSpeedsMmPerS = [25, 50] as const;
export type PaperSpeedMmPerS = (typeof paperSpeedsMmPerS)[number];

/** Allowed gains in mm/mV: half, standard, double (Kligfield et al. 2007, Part I; calibration-step texts). */
export const gainsMmPerMv = [5, 10, 20] as const;
export type GainMmPerMv = (typeof gainsMmPerMv)[number];

/** A small box is 1 mm of paper; a large box is 5 small boxes (Guyton & Hall, normal ECG chapter). */
export const smallBoxesPerLargeBox = 5;

/** Duration of one small box: 1 mm x 1000 / speed (40 ms at 25 mm/s, 20 ms at 50 mm/s). */
export function smallBoxMs(paperSpeedMmPerS: number): number {
  return 1000 / paperSpeedMmPerS;
}

/** Small boxes (fractions allowed) to milliseconds at the recorded paper speed. */
export function smallBoxesToMs(smallBoxes: number, paperSpeedMmPerS: number): number {
  return (smallBoxes * 1000) / paperSpeedMmPerS;
}

/** Large boxes (fractions allowed) to milliseconds at the recorded paper speed. */
export function largeBoxesToMs(largeBoxes: number, paperSpeedMmPerS: number): number {
  return smallBoxesToMs(largeBoxes * smallBoxesPerLargeBox, paperSpeedMmPerS);
}

/** Milliseconds back to small boxes at the recorded paper speed (for messages that speak in boxes). */
export function msToSmallBoxes(ms: number, paperSpeedMmPerS: number): number {
  return (ms * paperSpeedMmPerS) / 1000;
}

/** Vertical deflection in mm to millivolts at the recorded gain (10 mm/mV standard). */
export function mmToMv(mm: number, gainMmPerMv: number): number {
  return mm / gainMmPerMv;
}
