import { ValidationError } from './field-error.ts';
import type { ShiftInstance, ShiftPattern } from './shifts.ts';
import { localDateTimeToEpochMs, shiftAt } from './shifts.ts';

/**
 * The shift a key such as '2026-03-28/Night' (ShiftInstance.key) names in a unit's pattern and time
 * zone, or null when it names none: an unknown shift name, a date that does not exist, or a start
 * swallowed by a clock change. Handovers, printouts and exports name their shift by this key.
 */
export function shiftFromKey(key: string, pattern: ShiftPattern, timeZone: string): ShiftInstance | null {
  const match = /^(\d{4}-\d{2}-\d{2})\/(.+)$/.exec(key);
  if (!match) return null;
  const [, localDate, name] = match;
  const definition = pattern.shifts.find((s) => s.name === name);
  if (!definition || localDate === undefined) return null;
  try {
    const shift = shiftAt(localDateTimeToEpochMs(localDate, definition.startLocalTime, timeZone), pattern, timeZone);
    return shift.key === key ? shift : null;
  } catch (error) {
    if (error instanceof ValidationError) return null;
    throw error;
  }
}
