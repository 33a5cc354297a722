import type { ShiftDefinition } from '../core/shifts.ts';

/** Common rosters a ward starts from; the times are editable in unit settings. */
export const shiftPresets: Array<{ id: string; name: string; shifts: ShiftDefinition[] }> = [
  { id: '2x12', name: '2 × 12 h: Day 07:00, Night 19:00', shifts: [{ name: 'Day', startLocalTime: '07:00' }, { name: 'Night', startLocalTime: '19:00' }] },
  { id: '3x8', name: '3 × 8 h: Early 07:00, Late 15:00, Night 23:00', shifts: [{ name: 'Early', startLocalTime: '07:00' }, { name: 'Late', startLocalTime: '15:00' }, { name: 'Night', startLocalTime: '23:00' }] },
];

/** A pattern as editable text: "Day 07:00, Night 19:00". */
export function shiftsAsText(shifts: readonly ShiftDefinition[]): string {
  return shifts.map((s) => `${s.name} ${s.startLocalTime}`).join(', ');
}

/** Reads "Day 07:00, Night 19:00" back into shifts; a part without a time keeps its text so the check names it. */
export function shiftsFromText(text: string): ShiftDefinition[] {
  return text
    .split(',')
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part) => {
      const match = /^(.*?)\s+(\S+)$/.exec(part);
      return match ? { name: match[1]!.trim(), startLocalTime: match[2]! } : { name: part, startLocalTime: '' };
    });
}
