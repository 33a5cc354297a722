/** Printed with every analysis: the figures support a decision, they never make it. */
export const decisionSupportCaution =
  "Decision support only. Every figure is arithmetic on the box counts entered; verify rate, intervals and rhythm on the monitor and the strip before acting. Your unit's protocol and your licensed practice govern. Limits are configurable defaults: unit policy decides them.";

/** Printed after a verification run: a pass shows the arithmetic matches the unit's worked examples, nothing more. */
export const verificationCaution =
  "A pass means the program's arithmetic matched your worked examples within the stated tolerance. It does not make the limits right for your unit: review them against unit policy.";
