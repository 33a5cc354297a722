import { render, screen } from '@testing-library/preact';
import { describe, expect, it } from 'vitest';
import { ScheduleBadge } from '../../src/app/components/ScheduleBadge.tsx';

const base = { lastReadMs: null, nextDueMs: Date.UTC(2026, 2, 10, 8, 0), dueInMs: null } as const;

describe('ScheduleBadge', () => {
  it('says a new patient\'s baseline read is due now, not "overdue by 0 min"', () => {
    render(<ScheduleBadge schedule={{ ...base, status: 'overdue', overdueByMs: 20_000 }} timeZone="Europe/London" />);
    expect(screen.getByText('DUE NOW')).toBeTruthy();
    expect(document.body.textContent).toContain('baseline read for a new patient');
    expect(document.body.textContent).not.toContain('OVERDUE');
  });
  it('says OVERDUE with the time once a minute has passed', () => {
    render(<ScheduleBadge schedule={{ ...base, status: 'overdue', overdueByMs: 24 * 60_000 }} timeZone="Europe/London" />);
    expect(screen.getByText('OVERDUE')).toBeTruthy();
    expect(document.body.textContent).toContain('(baseline read needed)');
  });
});
