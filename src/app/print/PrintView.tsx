import { useCharting } from '../app-context.ts';
import { handoverCautions } from '../../core/handover-summary.ts';
import { escalationCaution } from '../../core/read-flags.ts';
import { recordExportAudit } from '../handover-export-audit.ts';
import type { PaperSize } from '../handover-routes.ts';
import { sortDeskRows } from '../handover-desk-rows.ts';
import { hrefOf } from '../routes.ts';
import { auditConnectionOf } from '../screens/handover/ExportButtons.tsx';
import { useHandoverRows } from '../screens/handover/use-handover-rows.ts';
import type { PrintContext } from './PrintBedSection.tsx';
import { PrintBedSection } from './PrintBedSection.tsx';
import { PrintUnitOverview } from './PrintUnitOverview.tsx';

const paperNames: Record<PaperSize, string> = { a4: 'A4', letter: 'US Letter' };

/** The caution printed at the foot of every page. */
export const printCautionText = `${handoverCautions.join(' ')} ${escalationCaution}`;

/**
 * The print layout for one bed (`bedId`) or the whole unit: a toolbar on screen (paper size, Print),
 * then sheets as they will print, one bed per page run, each page headed with unit, bed, patient,
 * shift, printer and time and footed with the clinical caution. The app's header and navigation
 * are not drawn here at all, so nothing of them reaches paper.
 */
export function PrintView({ bedId, shiftKey, paper }: { bedId: string | null; shiftKey: string | null; paper: PaperSize }) {
  const charting = useCharting();
  const { db, unit, policy, clinician } = charting;
  const { shift, nowMs, rows } = useHandoverRows(shiftKey);
  const back = bedId === null ? hrefOf({ screen: 'handover', shiftKey: shift.key }) : hrefOf({ screen: 'handover-bed', bedId, shiftKey: shift.key });
  if (!rows) return <p class="loading">Preparing the printout…</p>;

  const monitored = sortDeskRows(rows, 'bed').filter((r) => r.stay !== null);
  const chosen = bedId === null ? monitored : monitored.filter((r) => r.bed.id === bedId);
  const ctx: PrintContext = { unitName: unit.name, timeZone: unit.timeZone, shift, printedByName: clinician.name, printedAtMs: nowMs, policy };
  const print = () => {
    // The audit records that a printout was made; the browser's dialog may still be cancelled.
    void recordExportAudit(db, auditConnectionOf(charting), { format: 'print', scope: bedId === null ? 'unit' : 'bed', recordId: bedId ?? shift.key, recordCount: chosen.length, clientTimeMs: Date.now() }).catch(() => undefined);
    window.print();
  };

  return (
    <div class={`print-view paper-${paper}`}>
      <div class="print-toolbar">
        <a class="button" href={back}>
          Back
        </a>
        <nav class="segmented" aria-label="Paper size">
          <span class="segmented-label">Paper</span>
          {(['a4', 'letter'] as const).map((p) => (
            <a key={p} aria-current={p === paper ? 'true' : undefined} class={`segment${p === paper ? ' on' : ''}`} href={hrefOf({ screen: 'print', bedId, shiftKey: shift.key, paper: p })}>
              {paperNames[p]}
            </a>
          ))}
        </nav>
        <button type="button" class="button button-primary" onClick={print}>
          Print
        </button>
        <p class="print-toolbar-note">
          {bedId === null ? `Unit summary: an overview page, then ${chosen.length} ${chosen.length === 1 ? 'bed' : 'beds'}, each starting on a new page.` : 'One bed\u2019s shift summary.'} Choose "Save as PDF" in the print dialog for a file.
        </p>
      </div>
      {chosen.length === 0 ? <p class="empty-state">{bedId === null ? 'No bed was monitored during this shift: there is nothing to print.' : 'No patient was monitored on this bed during this shift.'}</p> : null}
      <div class="print-sheets">
        {bedId === null && chosen.length > 0 ? <PrintUnitOverview rows={sortDeskRows(rows, 'attention')} ctx={ctx} /> : null}
        {chosen.map((row) => (
          <PrintBedSection key={row.bed.id} row={row} ctx={ctx} />
        ))}
      </div>
      <footer class="print-caution">
        {printCautionText}
      </footer>
    </div>
  );
}
