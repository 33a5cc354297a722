/** The caution every screen with figures carries. */
export const decisionSupportText = "Decision support only: verify on the monitor and follow your unit's protocol.";

/** The caution line, shown near figures. */
export function DecisionSupportNote() {
  return (
    <p class="caution-line" role="note">
      {decisionSupportText}
    </p>
  );
}
