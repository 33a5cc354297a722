import { useState } from 'preact/hooks';
import { browserConnection } from '../../../sync/browser-sync-engine.ts';
import type { Charting } from '../../app-context.ts';
import { useCharting } from '../../app-context.ts';
import { downloadFile } from '../../handover-download.ts';
import type { ExportAuditEntry, ExportAuditOutcome } from '../../handover-export-audit.ts';
import { recordExportAudit } from '../../handover-export-audit.ts';
import type { ExportFile, ExportFormat } from '../../handover-export.ts';

/** Where export audits go: the unit server this app came from, or nowhere beyond the tablet (demo ward, no server). */
export function auditConnectionOf(charting: Pick<Charting, 'sync' | 'demoWard'>) {
  return charting.sync && !charting.demoWard ? browserConnection() : null;
}

const auditWords: Record<ExportAuditOutcome, string> = {
  sent: "Recorded in the unit's audit trail.",
  queued: "The audit record waits on this tablet and goes to the unit server at the next sync.",
  'kept-on-tablet': 'Recorded on this tablet (no unit server to send the audit record to).',
};

/** Generates, downloads and audits one export; returns the sentence to show. */
export async function exportAndAudit(
  charting: Pick<Charting, 'db' | 'sync' | 'demoWard'>,
  make: () => ExportFile,
  audit: Omit<ExportAuditEntry, 'recordCount' | 'clientTimeMs' | 'format'> & { format: ExportFormat },
): Promise<string> {
  const file = make();
  downloadFile(file);
  const outcome = await recordExportAudit(charting.db, auditConnectionOf(charting), { ...audit, recordCount: file.readCount, clientTimeMs: Date.now() });
  const problems = file.problems.length > 0 ? ` ${file.problems.length} ${file.problems.length === 1 ? 'read was' : 'reads were'} written without figures: the stored counts could not be derived.` : '';
  return `Downloaded ${file.fileName} (${file.readCount} ${file.readCount === 1 ? 'read' : 'reads'}).${problems} ${auditWords[outcome]}`;
}

/** "Download FHIR (JSON)" and "Download CSV" for a stay or a shift, with what happened said beside them. */
export function ExportButtons({ what, make, audit }: { what: string; make: (format: ExportFormat) => ExportFile; audit: Omit<ExportAuditEntry, 'recordCount' | 'clientTimeMs' | 'format'> }) {
  const charting = useCharting();
  const [message, setMessage] = useState<{ text: string; problem: boolean } | null>(null);
  const [busy, setBusy] = useState(false);
  const run = (format: ExportFormat) => {
    setBusy(true);
    exportAndAudit(charting, () => make(format), { ...audit, format })
      .then((text) => setMessage({ text, problem: false }))
      .catch((error: unknown) => setMessage({ text: `The export could not be made: ${error instanceof Error ? error.message : 'unknown problem'}.`, problem: true }))
      .finally(() => setBusy(false));
  };
  return (
    <div class="export-buttons" role="group" aria-label={`Export ${what}`}>
      <span class="export-what">{what}:</span>
      <button type="button" class="button" disabled={busy} onClick={() => run('fhir')}>
        Download FHIR (JSON)
      </button>
      <button type="button" class="button" disabled={busy} onClick={() => run('csv')}>
        Download CSV
      </button>
      {message ? (
        <p class={message.problem ? 'form-errors' : 'export-done'} role="status">
          {message.text}
        </p>
      ) : null}
    </div>
  );
}
