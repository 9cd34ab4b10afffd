import { type BridgeDcOutput, type BridgeElementsInput, bridgeDcInput } from "../../contracts/bridge.js";
import { analyseBridgeDc, type BridgeDcResult } from "../../domain/checks/bridge-dc.js";
import { dcSaving } from "../../domain/checks/bridge-saving.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { toBridgeElements } from "../map/bridge-elements.js";
import { publicProcedure } from "../trpc.js";

export const bridgeDc = publicProcedure.input(bridgeDcInput).query(({ input, ctx }): BridgeDcOutput => {
  const assumptions: string[] = [];
  const sourceResistanceOhm = input.sourceResistanceOhm ?? 0;
  if (input.sourceResistanceOhm === undefined) assumptions.push("sourceResistanceOhm: 0 (default)");
  const run = (elements: BridgeElementsInput, path: string) =>
    analyseBridgeDc({ elements: toBridgeElements(elements, ctx.catalog, [path], assumptions), supplyV: input.supplyV, sourceResistanceOhm, load: input.load, ambientC: input.ambientC });
  const bridge = run(input.bridge, "bridge");
  const compareTo = input.compareTo === undefined ? undefined : run(input.compareTo, "compareTo");
  const metrics: Record<string, number> = {};
  addMetrics(metrics, "", bridge);
  if (compareTo !== undefined) addMetrics(metrics, "compareTo.", compareTo);
  const saving =
    compareTo === undefined
      ? undefined
      : (() => {
          const positive = dcSaving(bridge.positive, compareTo.positive);
          const negative = dcSaving(bridge.negative, compareTo.negative);
          return { ...(positive === undefined ? {} : { positive }), ...(negative === undefined ? {} : { negative }) };
        })();
  return {
    modelVersion: MODEL_VERSION,
    caution: CAUTION,
    assumptions,
    metrics,
    bridge,
    ...(compareTo === undefined ? {} : { compareTo }),
    ...(saving === undefined ? {} : { saving }),
  };
});

/** Per polarity: load voltage, total loss; per element: current, reverse voltage, Tj and their limits. */
function addMetrics(out: Record<string, number>, prefix: string, r: BridgeDcResult): void {
  for (const p of [r.positive, r.negative]) {
    if (!("elements" in p)) continue;
    out[`${prefix}${p.polarity}.loadV`] = p.loadV;
    out[`${prefix}${p.polarity}.totalLossW`] = p.totalLossW;
    for (const e of p.elements) {
      const base = `${prefix}${p.polarity}.element.${e.position}.`;
      out[`${base}currentA`] = e.currentA;
      out[`${base}lossW`] = e.lossW;
      out[`${base}tjC`] = e.tjC;
      out[`${base}tjMaxC`] = e.tjMaxC;
      out[`${base}reverseV`] = e.reverseV;
      out[`${base}reverseRatingV`] = e.reverseRatingV;
    }
  }
}
