import type { Severity } from '../../core/unit-policy.ts';

/** Severity in words, as every banner and board cell shows it (never colour alone). */
export const severityWords: Record<Severity, string> = { urgent: 'URGENT', caution: 'Caution', note: 'Note' };

/** Our own shapes: urgent a filled diamond with two bars, caution a ringed circle with one bar, note an open square. */
function Shape({ severity }: { severity: Severity }) {
  if (severity === 'urgent') {
    return (
      <svg viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" class="sev-shape">
        <path d="M12 1 L23 12 L12 23 L1 12 Z" fill="currentColor" />
        <rect x="8.2" y="6.5" width="2.6" height="11" fill="#fff" />
        <rect x="13.2" y="6.5" width="2.6" height="11" fill="#fff" />
      </svg>
    );
  }
  if (severity === 'caution') {
    return (
      <svg viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" class="sev-shape">
        <circle cx="12" cy="12" r="9.5" fill="none" stroke="currentColor" stroke-width="3" />
        <rect x="10.5" y="6" width="3" height="12" fill="currentColor" />
      </svg>
    );
  }
  return (
    <svg viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" class="sev-shape">
      <rect x="3" y="3" width="18" height="18" fill="none" stroke="currentColor" stroke-width="2.5" />
      <rect x="10.8" y="10" width="2.4" height="8" fill="currentColor" />
      <rect x="10.8" y="6" width="2.4" height="2.4" fill="currentColor" />
    </svg>
  );
}

/** A severity's shape and word together. */
export function SeverityMark({ severity, count }: { severity: Severity; count?: number }) {
  return (
    <span class={`sev sev-${severity}`}>
      <Shape severity={severity} />
      <span class="sev-word">{count !== undefined ? `${count} ${severityWords[severity]}` : severityWords[severity]}</span>
    </span>
  );
}
