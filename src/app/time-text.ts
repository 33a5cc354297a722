/** Times for the screen, always in the unit's time zone (the tablet's own zone may differ). */

// Building an Intl.DateTimeFormat costs far more than using one (a 48-bed desk formats thousands of
// times), so each format is made once per time zone and kept.
const formats = new Map<string, Intl.DateTimeFormat>();
function formatIn(kind: 'clock' | 'day-clock', timeZone: string): Intl.DateTimeFormat {
  const key = `${kind} ${timeZone}`;
  let format = formats.get(key);
  if (!format) {
    const day = kind === 'day-clock' ? ({ weekday: 'short', day: 'numeric', month: 'short' } as const) : {};
    format = new Intl.DateTimeFormat('en-GB', { timeZone, ...day, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    formats.set(key, format);
  }
  return format;
}

/** 'HH:mm' in the unit's zone. */
export function clockText(epochMs: number, timeZone: string): string {
  return formatIn('clock', timeZone).format(new Date(epochMs));
}

/** 'Tue 12 May, 03:10' in the unit's zone. */
export function dayClockText(epochMs: number, timeZone: string): string {
  return formatIn('day-clock', timeZone).format(new Date(epochMs));
}

/** A duration in words for due and overdue times: '45 min', '2 h 05 min'. */
export function durationText(ms: number): string {
  const totalMinutes = Math.max(0, Math.round(ms / 60_000));
  const hours = Math.floor(totalMinutes / 60);
  const minutes = totalMinutes % 60;
  if (hours === 0) return `${minutes} min`;
  return `${hours} h ${String(minutes).padStart(2, '0')} min`;
}
