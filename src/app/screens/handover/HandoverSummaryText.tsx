import type { HandoverSummary } from '../../../core/handover-summary.ts';

const sections = [
  { key: 'situation', title: 'Situation' },
  { key: 'background', title: 'Background' },
  { key: 'assessment', title: 'Assessment' },
  { key: 'recommendation', title: 'Recommendation' },
] as const;

/** The generated summary in its four parts (SBAR order), each sentence from the core as written. */
export function HandoverSummaryText({ summary, headingLevel = 3 }: { summary: HandoverSummary; headingLevel?: 2 | 3 }) {
  const Heading = headingLevel === 2 ? 'h2' : 'h3';
  return (
    <div class="sbar">
      {sections.map(({ key, title }) => (
        <section key={key} class={`sbar-part sbar-${key}`} aria-label={title}>
          <Heading>{title}</Heading>
          <ul>
            {summary[key].map((line, i) => (
              <li key={i}>{line}</li>
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}
