import type { HandoverSummary } from '../../../core/handover-summary.ts';

/** The warning that reads were added or amended after the handover was written, naming each one. */
export function ChangedSinceWritten({ summary }: { summary: HandoverSummary }) {
  if (!summary.changedSinceWritten) return null;
  return (
    <div class="changed-warning" role="alert">
      <p class="changed-title">Changed since the handover was written</p>
      <ul>
        {summary.changesSinceWritten.map((c) => (
          <li key={c.readId}>{c.sentence}</li>
        ))}
      </ul>
      <p>The generated summary shows the reads as they stand now; the giving nurse's own text was written before these changes.</p>
    </div>
  );
}
