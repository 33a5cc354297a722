/**
 * Rounds a figure for display, half away from zero to the given decimals (462.5 ms shows as 463).
 * There is no published rounding rule for QTc; flags compare the unrounded value, so rounding
 * changes what is shown, never what is flagged.
 */
export function roundForDisplay(value: number, decimals = 0): number {
  const factor = 10 ** decimals;
  // The epsilon absorbs binary representation error (e.g. 1.005 stored as 1.00499...).
  const scaled = Math.abs(value) * factor;
  const rounded = Math.floor(scaled + 0.5 + 1e-9) / factor;
  if (rounded === 0) return 0; // never show -0
  return value < 0 ? -rounded : rounded;
}
