import { parseTypedCount } from '../read-form-values.ts';

interface Props {
  id: string;
  label: string;
  value: string;
  onInput: (text: string) => void;
  /** Half a small box by default; whole numbers for the six-second count. */
  step?: number;
  hint?: string;
  /** The figure this count gives, from the core (e.g. "160 ms"). */
  readout?: string | null;
  error?: string | null;
  onRemove?: () => void;
}

function stepped(text: string, delta: number): string {
  const value = parseTypedCount(text);
  const base = value === undefined || Number.isNaN(value) ? 0 : value;
  const next = Math.max(0, Math.round((base + delta) * 2) / 2);
  return String(next);
}

/** A count typed or stepped with big buttons (for gloved hands); the text is kept exactly as typed. */
export function BoxCountField({ id, label, value, onInput, step = 0.5, hint, readout, error, onRemove }: Props) {
  const errorId = `${id}-error`;
  return (
    <div class={`count-field${error ? ' has-error' : ''}`}>
      <label for={id} class="count-label">
        {label}
        {hint ? <span class="count-hint"> {hint}</span> : null}
      </label>
      <div class="count-row">
        <button type="button" class="step" aria-label={`${label}: ${step} less`} onClick={() => onInput(stepped(value, -step))}>
          −
        </button>
        <input
          id={id}
          class="count-input"
          type="text"
          inputMode="decimal"
          autoComplete="off"
          value={value}
          aria-invalid={error ? 'true' : 'false'}
          aria-describedby={error ? errorId : undefined}
          onInput={(e) => onInput((e.currentTarget as HTMLInputElement).value)}
        />
        <button type="button" class="step" aria-label={`${label}: ${step} more`} onClick={() => onInput(stepped(value, step))}>
          +
        </button>
        {readout ? <output class="count-readout" for={id}>{readout}</output> : null}
        {onRemove ? (
          <button type="button" class="remove" aria-label={`Remove ${label}`} onClick={onRemove}>
            Remove
          </button>
        ) : null}
      </div>
      {error ? (
        <p id={errorId} class="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
