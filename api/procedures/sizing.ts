import {
  type SizingCatalogOutput,
  type SizingSpecOutput,
  sizingCatalogInput,
  sizingCatalogOutput,
  sizingSpecInput,
  sizingSpecOutput,
} from "../../contracts/sizing.js";
import { CAUTION, MODEL_VERSION } from "../../domain/provenance.js";
import { matchCatalog } from "../../domain/sizing/catalog-match.js";
import { specifyStage } from "../../domain/sizing/stage-spec.js";
import type { CatalogPart } from "../context.js";
import { inputProblem } from "../input-problem.js";
import type { DatasheetMaxSpec } from "../map/datasheet-max.js";
import { toReviewRequirement } from "../map/requirement.js";
import { resolveStage } from "../map/resolve-stage.js";
import { stageLabel } from "../map/reverse-inputs.js";
import { resolveRuleSet } from "../map/rule-set.js";
import { withPartCorner } from "../map/part-corner.js";
import { sizingContext } from "../map/sizing-context.js";
import { type Answer, defineProcedure } from "../define-procedure.js";

const CAUTION_NOTE =
  "the specification holds each template's laws (temperature law, gate-drive points, Is(T)) and thermal path; a part with different laws needs its own sizing";

/**
 * sizing.spec: per template part, the limiting specification (each line with its corner and the
 * rule or requirement field that set it). sizing.catalog: every catalog part sized against
 * itself, with margins and the first line it misses, ranked as the review ranks.
 */
export const sizing = [
  defineProcedure({
    name: "sizing.spec",
    input: sizingSpecInput,
    output: sizingSpecOutput,
    handler: ({ input, ctx }): Answer<SizingSpecOutput> => {
      const assumptions: string[] = [CAUTION_NOTE];
      const req = toReviewRequirement(input.requirement, assumptions);
      const set = resolveRuleSet(input.ruleSet ?? "default", ctx, ["ruleSet"]);
      if (input.ruleSet === undefined) assumptions.push("rule set: the built-in default (common practice)");
      const specifications = input.templates.map((sent, index) => {
        const path = ["templates", index, "stage"];
        const stage = resolveStage(sent.stage, ctx.catalog, path, assumptions, sent.thermal);
        const c = withPartCorner(sent, stage, path, assumptions);
        const sctx = sizingContext(
          input.requirement,
          req,
          set,
          stage,
          c,
          input.turnOff,
          ["templates", index],
          assumptions,
        );
        const spec = specifyStage(sctx, stage.model);
        return {
          index,
          label: c.label ?? stage.spec.name ?? stage.partId ?? `template ${index}`,
          stage: stageLabel(stage.spec, stage.partId),
          items: [...spec.items],
        };
      });
      return { modelVersion: MODEL_VERSION, caution: CAUTION, ruleSet: set.stamp, specifications, assumptions };
    },
  }),
  defineProcedure({
    name: "sizing.catalog",
    input: sizingCatalogInput,
    output: sizingCatalogOutput,
    handler: ({ input, ctx }): Answer<SizingCatalogOutput> => {
      const assumptions: string[] = [CAUTION_NOTE];
      const req = toReviewRequirement(input.requirement, assumptions);
      const set = resolveRuleSet(input.ruleSet ?? "default", ctx, ["ruleSet"]);
      if (input.ruleSet === undefined) assumptions.push("rule set: the built-in default (common practice)");
      const dm = input.datasheetMax;
      for (const field of ["currentLimitMinA", "overvoltageCutoffMinV", "overvoltageCutoffMaxV"] as const)
        if (dm?.[field] !== undefined)
          throw inputProblem(
            "invalid-input",
            ["datasheetMax", field],
            "one part's current limit or cut-off tolerance cannot stand for the whole catalog: leave it out here and give it in the part's own catalog entry (datasheetMax), per template (sizing.spec) or per candidate (review)",
          );
      const wanted = input.kinds === undefined ? undefined : new Set<string>(input.kinds);
      const parts = ctx.catalog.list().filter((p) => wanted === undefined || wanted.has(p.stage.kind));
      const candidates = parts.map((p) => {
        const stage = resolveStage(
          { kind: "catalog-part", partId: p.id },
          ctx.catalog,
          ["catalog", p.id],
          assumptions,
          input.thermal,
        );
        const corner = partCorner(p, dm, assumptions);
        const sctx = sizingContext(
          input.requirement,
          req,
          set,
          stage,
          corner.datasheetMax === undefined ? {} : { datasheetMax: corner.datasheetMax },
          input.turnOff,
          corner.path,
          assumptions,
          "report",
        );
        return {
          ctx: sctx,
          partId: p.id,
          label: p.stage.name ?? p.description,
          stage: stage.model,
          ...(p.stage.costEach === undefined ? {} : { cost: p.stage.costEach }),
        };
      });
      const matched = matchCatalog(candidates);
      return {
        modelVersion: MODEL_VERSION,
        caution: CAUTION,
        ruleSet: set.stamp,
        parts: matched.map((m) => ({ ...m, items: [...m.items] })),
        // One sentence a part for a shared default would repeat: each once.
        assumptions: [...new Set(assumptions)],
      };
    },
  }),
] as const;

/**
 * The datasheet-maximum corner a catalog part is judged at: its own (the catalog entry's
 * datasheetMax), else the request's datasheetMax as the default, else typical values; which one,
 * said in `assumptions`. `path` is where a refused value sits (the part's entry, or the request's).
 */
function partCorner(
  p: CatalogPart,
  requestDm: DatasheetMaxSpec | undefined,
  assumptions: string[],
): { datasheetMax?: DatasheetMaxSpec; path: (string | number)[] } {
  if (p.datasheetMax !== undefined) {
    assumptions.push(
      `catalog.${p.id}: judged at its own datasheet-maximum corner (the catalog entry's datasheetMax)${requestDm === undefined ? "" : "; the request's datasheetMax is not applied to it"}`,
    );
    return { datasheetMax: p.datasheetMax, path: ["catalog", p.id] };
  }
  if (requestDm !== undefined) {
    assumptions.push(
      `catalog.${p.id}: its catalog entry carries no datasheetMax: judged at the request's datasheetMax (the default for such parts)`,
    );
    return { datasheetMax: requestDm, path: [] };
  }
  assumptions.push(
    `catalog.${p.id}: its catalog entry carries no datasheetMax and the request gives none: judged at typical values only (no datasheet-maximum corner)`,
  );
  return { path: [] };
}
