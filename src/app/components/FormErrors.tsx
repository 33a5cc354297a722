/** What stops a form from saving, one message a line, announced as one alert; nothing when all is well. */
export function FormErrors({ messages, label }: { messages: readonly string[]; label?: string }) {
  if (messages.length === 0) return null;
  return (
    <ul class="form-errors" role="alert" aria-label={label}>
      {messages.map((m, i) => (
        // Messages name their field, so they rarely repeat; the index keeps a repeat from sharing a key.
        <li key={`${i}:${m}`}>{m}</li>
      ))}
    </ul>
  );
}
