import type { HoldUpOutcome } from "../../domain/checks/hold-up.js";
import { formatQuantity } from "../../domain/rules/quantity-text.js";

/**
 * A stage's hold-up against the plain requirement (holdUpS ≥ requiredHoldUpS), so that an
 * outcome of "holds" never stands beside a failed requirement without saying so. The rule
 * set's hold-up rules may ask more (a margin for capacitance tolerance); their verdicts say so.
 */
export function holdUpAgainstRequirement(
  r: HoldUpOutcome,
  requiredS: number,
): { meetsRequirement: boolean; requirementReason: string } {
  const req = formatQuantity(requiredS, "s");
  switch (r.outcome) {
    case "holds":
    case "drains-back": {
      const got = formatQuantity(r.holdUpS, "s");
      const meets = r.holdUpS >= requiredS;
      return {
        meetsRequirement: meets,
        requirementReason: meets
          ? `hold-up ${got} >= required ${req}`
          : `hold-up ${got} < required ${req}: the requirement is not met`,
      };
    }
    case "no-hold-up":
      return { meetsRequirement: requiredS <= 0, requirementReason: `no hold-up (${r.reason}); required ${req}` };
    case "not-interrupted":
      return { meetsRequirement: true, requirementReason: `the output is never interrupted; required ${req}` };
  }
}
