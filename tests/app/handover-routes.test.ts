import { describe, expect, it } from 'vitest';
import { bedText } from '../../src/app/handover-bed-text.ts';
import { handoverShift, shiftChoices, shiftFromKey, shiftText } from '../../src/app/handover-shift.ts';
import type { Route } from '../../src/app/routes.ts';
import { hrefOf, parseRoute } from '../../src/app/routes.ts';
import type { Unit } from '../../src/core/records.ts';
import { deskUnit } from './handover-fixture.tsx';

describe('handover routes', () => {
  const routes: Route[] = [
    { screen: 'handover', shiftKey: null },
    { screen: 'handover', shiftKey: '2026-03-28/Night' },
    { screen: 'handover-bed', bedId: 'bed 7/a', shiftKey: '2026-03-10/Day' },
    { screen: 'print', bedId: null, shiftKey: '2026-03-10/Day', paper: 'a4' },
    { screen: 'print', bedId: 'bed-desk-0002', shiftKey: null, paper: 'letter' },
  ];
  it.each(routes)('reads back the hash it writes for %o', (route) => {
    expect(parseRoute(hrefOf(route))).toEqual(route);
  });

  it('writes the shift key and paper size as a query', () => {
    expect(hrefOf({ screen: 'print', bedId: null, shiftKey: '2026-03-10/Day', paper: 'letter' })).toBe('#/print/unit?shift=2026-03-10%2FDay&paper=letter');
  });

  it.each(['#/print', '#/print/bed', '#/print/elsewhere'])('opens the board for the incomplete print address "%s"', (hash) => {
    expect(parseRoute(hash)).toEqual({ screen: 'board' });
  });

  it('falls back to A4 for an unknown paper size', () => {
    expect(parseRoute('#/print/unit?paper=a3')).toEqual({ screen: 'print', bedId: null, shiftKey: null, paper: 'a4' });
  });
});

describe('which shift the desk shows', () => {
  const berlin: Unit = { ...deskUnit, timeZone: 'Europe/Berlin' };

  it('opens on the shift under way, with the one before it as the alternative', () => {
    const { current, previous } = shiftChoices(deskUnit, Date.UTC(2026, 2, 10, 18, 30));
    expect([current.key, previous.key]).toEqual(['2026-03-10/Day', '2026-03-09/Night']);
  });

  it('finds a shift again from its key, and ignores a key naming no shift of the unit', () => {
    expect(shiftFromKey('2026-03-09/Night', deskUnit)?.startMs).toBe(Date.UTC(2026, 2, 9, 19, 0));
    expect(shiftFromKey('2026-03-09/Late', deskUnit)).toBeNull();
    expect(shiftFromKey('2026-02-30/Day', deskUnit)).toBeNull();
    expect(shiftFromKey('nonsense', deskUnit)).toBeNull();
    expect(handoverShift(deskUnit, Date.UTC(2026, 2, 10, 18, 30), 'nonsense').key).toBe('2026-03-10/Day');
  });

  // The DST cases need the unit's zone, not the machine's: Berlin moves its clocks on the last Sunday
  // of March (02:00 -> 03:00) and of October (03:00 -> 02:00) (EU summer-time rule, common knowledge).
  it('names a night shift across the spring clock change as 11 hours', () => {
    const night = shiftFromKey('2026-03-28/Night', berlin)!;
    expect(night.durationMs).toBe(11 * 3_600_000);
    expect(shiftText(night, berlin.timeZone)).toBe('Night shift, Sat 28 Mar, 19:00 to 07:00 (11 h; the clocks changed during it)');
  });

  it('names a night shift across the autumn clock change as 13 hours', () => {
    const night = shiftFromKey('2026-10-24/Night', berlin)!;
    expect(shiftText(night, berlin.timeZone)).toBe('Night shift, Sat 24 Oct, 19:00 to 07:00 (13 h; the clocks changed during it)');
  });

  it('prints bed labels without doubling the word', () => {
    expect([bedText('Bed 3'), bedText('12'), bedText(' bed 4a ')]).toEqual(['Bed 3', 'Bed 12', 'bed 4a']);
  });
});
