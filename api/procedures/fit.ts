import { type FitOutput, fitInput, fitOutput } from "../../contracts/fit.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { diodeForwardFit, rdsOnTemperatureFit, reverseLeakageFit, zthFit } from "../map/fit-output.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

/** A datasheet curve's points in, the fitted law, its parameters and residuals out; no analysis. */
export const fit = defineProcedure({
  name: "fit",
  input: fitInput,
  output: fitOutput,
  handler: ({ input }): Answer<FitOutput> => {
    const assumptions: string[] = [];
    const body = (() => {
      switch (input.curve) {
        case "diode-forward":
          return diodeForwardFit(input, assumptions);
        case "rds-on-temperature":
          return rdsOnTemperatureFit(input, assumptions);
        case "zth":
          return zthFit(input, assumptions);
        case "reverse-leakage":
          return reverseLeakageFit(input, assumptions);
      }
    })();
    return { modelVersion: MODEL_VERSION, caution: CAUTION, ...body, assumptions };
  },
});
