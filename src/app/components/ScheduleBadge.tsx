import type { ScheduleState } from '../../core/read-schedule.ts';
import { clockText, durationText } from '../time-text.ts';

const oneMinuteMs = 60_000;

/** Where a bed stands on its read schedule, in words with a distinct outline (never colour alone). */
export function ScheduleBadge({ schedule, timeZone }: { schedule: ScheduleState; timeZone: string }) {
  switch (schedule.status) {
    case 'overdue':
      // The first read of a new patient is due at admission: "overdue by 0 min" would alarm for nothing.
      if (schedule.overdueByMs < oneMinuteMs) {
        return (
          <p class="due due-overdue">
            <span class="due-word">DUE NOW</span>
            {schedule.lastReadMs === null ? ' (baseline read for a new patient)' : ''}
          </p>
        );
      }
      return (
        <p class="due due-overdue">
          <span class="due-word">OVERDUE</span> by {durationText(schedule.overdueByMs)}
          {schedule.lastReadMs === null ? ' (baseline read needed)' : ''}
        </p>
      );
    case 'due-soon':
      return (
        <p class="due due-soon">
          <span class="due-word">Due soon</span> in {durationText(schedule.dueInMs ?? 0)} ({schedule.nextDueMs === null ? '' : clockText(schedule.nextDueMs, timeZone)})
        </p>
      );
    case 'on-time':
      return <p class="due due-ok">Next read due {schedule.nextDueMs === null ? '' : clockText(schedule.nextDueMs, timeZone)}</p>;
    case 'not-started':
      return <p class="due due-ok">Monitoring starts {schedule.nextDueMs === null ? '' : clockText(schedule.nextDueMs, timeZone)}</p>;
    case 'ended':
      return <p class="due due-ok">Monitoring ended</p>;
  }
}
