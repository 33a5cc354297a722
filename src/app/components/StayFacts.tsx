import type { Stay } from '../../core/records.ts';

const sexWords: Record<Stay['sex'], string> = { female: 'Female', male: 'Male', unknown: 'Sex not recorded' };

/** The stay facts that change how figures are read: sex, age band, pacing, bundle-branch block, drugs, baseline QTc. */
export function StayFacts({ stay, compact = false }: { stay: Stay; compact?: boolean }) {
  const facts = [
    sexWords[stay.sex],
    stay.ageBand ? `age ${stay.ageBand}` : null,
    stay.paced ? 'Paced' : null,
    stay.bundleBranchBlock ? 'Bundle-branch block' : null,
    stay.qtProlongingDrugs ? `QT-prolonging drugs: ${stay.qtProlongingDrugs}` : null,
    stay.baselineQtcMs !== undefined ? `Baseline QTc ${stay.baselineQtcMs} ms` : 'No baseline QTc',
  ].filter((f): f is string => f !== null);
  if (compact) return <p class="stay-facts">{facts.join(' · ')}</p>;
  return (
    <ul class="stay-facts-list">
      {facts.map((f) => (
        <li key={f}>{f}</li>
      ))}
    </ul>
  );
}
