import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../../adapters/batch/run-batch.js";
import { NO_CLAMP_THERMAL_REASON } from "../../../domain/checks/clamp-train.js";
import { builtInRuleSets } from "../../../domain/rules/built-in-sets.js";
import { demoContext } from "../../helpers/app.js";
import { pfetPulse1HeldByClamp } from "../../known-bad/designs.js";

// The soundness invariant for what the review cannot assess (common practice: a release gate must
// not pass what it has not checked): a negative pulse at a P-FET without requirement.turnOff, and an
// input clamp conducting in a pulse train without its thermal network, are explicit gaps with a
// reason; the rules that read them (load-reverse-voltage, clamp-train-tj) are missing their values
// (incomplete), never out of scope, so no built-in set passes the candidate.

const invoke = procedureInvoker(demoContext());
type Obj = Record<string, unknown>;
interface Verdict {
  ruleId: string;
  outcome: string;
  notApplicableCode: string | null;
  reason: string | null;
}
interface Candidate {
  verdict: string;
  rules: { verdicts: Verdict[] };
  transients: { pulseId: string; designClamp?: { train?: { outcome: string; reason?: string } } }[];
  pulseBackConduction?: { pulseId: string; outcome: string; reason?: string }[];
}

async function candidateOf(input: Obj, set: string): Promise<Candidate> {
  const out = (await invoke("review")?.({ ...input, ruleSet: set })) as { candidates: Candidate[] };
  const c = out.candidates[0];
  if (c === undefined) throw new Error("no candidate");
  return c;
}

const given = pfetPulse1HeldByClamp("100 Ohm") as { requirement: Obj; candidates: Obj[] };
// The design's clamp without its thermal network.
const { thermal: _net, ...bareClamp } = given.requirement["inputClamp"] as Obj;
const design: { requirement: Obj; candidates: Obj[] } = {
  ...given,
  requirement: { ...given.requirement, inputClamp: bareClamp },
};
const { turnOff: _t, ...noTurnOff } = design.requirement;
const withThermal: Obj = {
  ...design.requirement,
  inputClamp: {
    ...(design.requirement["inputClamp"] as Obj),
    thermal: [
      { rKPerW: 0.05, tauS: 1e-3 },
      { rKPerW: 0.5, tauS: 0.05 },
      { rKPerW: 20, tauS: 60 },
    ],
  },
};

describe("review gaps never let a set pass", () => {
  it.each(builtInRuleSets().map((s) => s.stamp.id))(
    "%s: pulse 1 at a P-FET without requirement.turnOff is not assessed, and load-reverse-voltage is missing its values",
    async (set) => {
      const { turnOff: _none, ...thermalOnly } = withThermal;
      const c = await candidateOf({ ...design, requirement: thermalOnly }, set);
      const p = c.pulseBackConduction?.find((x) => x.pulseId === "iso7637-2-pulse-1-12v");
      expect(p?.outcome).toBe("not-assessed");
      expect(p?.reason).toContain("add requirement.turnOff");
      const v = c.rules.verdicts.find((x) => x.ruleId === "load-reverse-voltage");
      expect(v?.outcome).toBe("not-applicable");
      expect(v?.notApplicableCode).toBe("missing-value");
      expect(c.verdict).not.toBe("pass");
    },
  );

  it.each(builtInRuleSets().map((s) => s.stamp.id))(
    "%s: a clamp conducting in pulse 1's train without inputClamp.thermal: the train is not assessed and clamp-train-tj is missing its values",
    async (set) => {
      const c = await candidateOf(design, set);
      const t = c.transients.find((x) => x.pulseId === "iso7637-2-pulse-1-12v");
      expect(t?.designClamp?.train).toEqual({ outcome: "not-assessed", reason: NO_CLAMP_THERMAL_REASON });
      const v = c.rules.verdicts.find((x) => x.ruleId === "clamp-train-tj");
      expect(v?.outcome).toBe("not-applicable");
      expect(v?.notApplicableCode).toBe("missing-value");
      expect(v?.reason).toContain("inputClamp.thermal");
      expect(c.verdict).not.toBe("pass");
    },
  );

  it("with both given (the turn-off event and the clamp's network) the same candidate is assessed and passes the default set", async () => {
    const c = await candidateOf({ ...design, requirement: withThermal }, "default");
    expect(c.rules.verdicts.find((x) => x.ruleId === "clamp-train-tj")?.outcome).toBe("pass");
    expect(c.rules.verdicts.find((x) => x.ruleId === "load-reverse-voltage")?.outcome).toBe("pass");
    expect(["pass", "warn"]).toContain(c.verdict);
  });

  it("a clamp without a network that no pulse train drives stays out of scope (no pulse: nothing to assess)", async () => {
    const c = await candidateOf({ ...design, requirement: { ...noTurnOff, transients: [] } }, "default");
    const v = c.rules.verdicts.find((x) => x.ruleId === "clamp-train-tj");
    expect(v?.notApplicableCode).toBe("not-required");
  });
});
