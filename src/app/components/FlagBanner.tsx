import { roundForDisplay } from '../../core/display-rounding.ts';
import type { Flag } from '../../core/read-flags.ts';
import { SeverityMark, severityWords } from './SeverityMark.tsx';

const comparatorText: Record<Flag['limit']['comparator'], string> = { '<': 'below', '>': 'above', '>=': 'at or above', '<=': 'at or below' };

// A rise flag carries the rise as its value: "QTc (Fridericia): 120 ms" would read as a QTc of 120 ms.
const valueNames: Partial<Record<Flag['code'], string>> = { 'qtc-rise-from-baseline': 'rise from baseline', 'qtc-rise-since-last-read': 'rise since the last read' };

/** One flag: severity in word and shape, the core's sentence, the value against its limit, and the limit's source. */
export function FlagBanner({ flag }: { flag: Flag }) {
  const value = `${roundForDisplay(flag.value)} ${flag.unit}`;
  const limit = `${comparatorText[flag.limit.comparator]} ${flag.limit.value} ${flag.unit}`;
  const valueName = valueNames[flag.code];
  return (
    <div class={`banner banner-${flag.severity}`} role="group" aria-label={`${severityWords[flag.severity]}: ${flag.figure}`}>
      <SeverityMark severity={flag.severity} />
      <div class="banner-body">
        <p class="banner-sentence">{flag.sentence}</p>
        {/* A formula mismatch compares nothing, so it shows no value against a limit. */}
        {flag.code === 'qtc-not-compared' ? null : (
          <p class="banner-figures">
            <span>
              {flag.figure}
              {valueName ? ` ${valueName}` : ''}: <strong>{value}</strong>
            </span>{' '}
            <span>limit: {limit}</span>
          </p>
        )}
        <p class="banner-source">Source: {flag.source}</p>
      </div>
    </div>
  );
}

/** Every flag of a read, most severe first (the core sorts them), announced politely as they change. */
export function FlagBanners({ flags }: { flags: readonly Flag[] }) {
  return (
    <div class="banners" aria-live="polite">
      {flags.map((f) => (
        <FlagBanner key={`${f.code}-${f.limit.key ?? ''}`} flag={f} />
      ))}
    </div>
  );
}
