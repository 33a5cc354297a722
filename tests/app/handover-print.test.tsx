import { fireEvent, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { AppShell } from '../../src/app/AppShell.tsx';
import { localExportAuditsKey } from '../../src/app/handover-export-audit.ts';
import { PrintView, printCautionText } from '../../src/app/print/PrintView.tsx';
import { beds, dayShiftKey, deskDb, deskNowMs, fixClock, hourMs, renderDesk, stays } from './handover-fixture.tsx';

const frames = () => [...document.querySelectorAll<HTMLElement>('table.print-frame')];
const headerOf = (frame: HTMLElement) => frame.querySelector('thead')!.textContent;

describe('the printed shift summary', () => {
  beforeEach(() => fixClock());
  afterEach(() => {
    vi.restoreAllMocks();
    vi.useRealTimers();
    location.hash = '';
  });

  it('prints an overview, then each monitored bed headed with unit, bed, patient, shift, printer and time', async () => {
    renderDesk(<PrintView bedId={null} shiftKey={dayShiftKey} paper="a4" />, { db: await deskDb() });
    await screen.findByRole('button', { name: 'Print' });
    const printed = frames();
    expect(printed).toHaveLength(1 + 3);
    expect(headerOf(printed[0]!)).toBe('Unit: 4 East Telemetry (test)Day shift 2026-03-10 07:00 to 2026-03-10 19:00 (12 h)Printed by Cara Ward at 2026-03-10 18:30');
    expect(printed.slice(1).map(headerOf)).toEqual(
      ['Bed 1Patient: K.L.', 'Bed 2Patient: M.N.', 'Bed 3Patient: O.P.'].map((who) => `${who}Unit: 4 East Telemetry (test)Day shift 2026-03-10 07:00 to 2026-03-10 19:00 (12 h)Printed by Cara Ward at 2026-03-10 18:30`),
    );
    expect(document.querySelector('.print-view')!.className).toBe('print-view paper-a4');
    expect(document.querySelector('footer.print-caution')!.textContent).toBe(printCautionText);
    expect(printCautionText).toMatch(/^Decision support only/);
  });

  it('prints each read with its figures and units, and each flag with its source', async () => {
    renderDesk(<PrintView bedId={beds[1]!.id} shiftKey={dayShiftKey} paper="letter" />, { db: await deskDb() });
    await screen.findByRole('button', { name: 'Print' });
    expect(frames()).toHaveLength(1);
    const table = screen.getByRole('table', { name: 'Reads this shift (3)' });
    expect(within(table).getAllByRole('columnheader').map((h) => h.textContent)).toEqual(['Strip time', 'By', 'Rate (bpm)', 'PR (ms)', 'QRS (ms)', 'QT (ms)', 'QTc (ms), Fridericia', 'Rhythm', 'Flags']);
    // 20 small boxes at 25 mm/s: 800 ms, 75 bpm; QT 13 boxes: 520 ms; QTc 520 / 0.8^(1/3) = 560 ms (Fridericia 1920).
    const firstRow = within(table).getAllByRole('row')[1]!;
    expect(within(firstRow).getAllByRole('cell').slice(0, 6).map((c) => c.textContent)).toEqual(['Bob Ward', '75', '160', '80', '520', '560']);
    const flags = screen.getByRole('region', { name: 'Flags and their sources' }).textContent!;
    expect(flags).toContain('URGENT, still open: High-risk QTc 560 ms (limit ≥ 500 ms)');
    expect(flags).toContain('Source: QTc of 500 ms or more: high torsade risk (Drew et al. 2010 AHA/ACCF statement');
    expect(document.querySelector('.print-view')!.className).toBe('print-view paper-letter');
    expect(screen.getByRole('link', { name: 'US Letter' }).getAttribute('aria-current')).toBe('true');
  });

  it('says so when a bed has no read this shift', async () => {
    const db = await deskDb();
    await db.stays.put({ ...stays[0]!, id: 'stay-desk-0004', bedId: beds[3]!.id, alias: 'Q.R.', startMs: deskNowMs - 2 * hourMs, updatedAtMs: deskNowMs - 2 * hourMs });
    renderDesk(<PrintView bedId={beds[3]!.id} shiftKey={dayShiftKey} paper="a4" />, { db });
    await screen.findByRole('button', { name: 'Print' });
    await waitFor(() => expect(document.querySelector('.print-empty')?.textContent).toBe('No read was recorded this shift (monitoring began at 2026-03-10 16:30).'));
    expect(screen.queryByRole('table', { name: /Reads this shift/ })).toBeNull();
  });

  it('calls the browser\'s print and records the printout in the audit', async () => {
    const db = await deskDb();
    // The test DOM has no print dialog; the app only needs the call.
    const print = vi.fn();
    window.print = print;
    renderDesk(<PrintView bedId={null} shiftKey={dayShiftKey} paper="a4" />, { db });
    fireEvent.click(await screen.findByRole('button', { name: 'Print' }));
    expect(print).toHaveBeenCalledTimes(1);
    await waitFor(async () => expect((await db.settings.get(localExportAuditsKey))?.value).toEqual([{ format: 'print', scope: 'unit', recordId: dayShiftKey, recordCount: 3, clientTimeMs: deskNowMs }]));
  });

  it('draws no app header or navigation on the print route', async () => {
    const db = await deskDb();
    location.hash = `#/print/unit?shift=${encodeURIComponent(dayShiftKey)}`;
    renderDesk(<AppShell onLock={() => undefined} storage={null} />, { db });
    await screen.findByRole('button', { name: 'Print' });
    expect(screen.queryByRole('navigation', { name: 'Main' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Lock screen' })).toBeNull();
    expect(frames()).toHaveLength(4);
  });
});
