/** A row of big toggle buttons for a small set of numbers (paper speed, gain). */
export function Segmented<T extends number>({ label, options, unit, value, onChange }: { label: string; options: readonly T[]; unit: string; value: T; onChange: (v: T) => void }) {
  return (
    <div class="segmented" role="radiogroup" aria-label={label}>
      <span class="segmented-label">{label}</span>
      {options.map((o) => (
        <button key={o} type="button" role="radio" aria-checked={o === value} class={`segment${o === value ? ' on' : ''}`} onClick={() => onChange(o)}>
          {o} {unit}
        </button>
      ))}
    </div>
  );
}
