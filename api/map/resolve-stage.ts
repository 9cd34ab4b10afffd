import { nearestName } from "../../contracts/zod-messages.js";
import type { DatasheetMax } from "../../contracts/datasheet-max.js";
import type { StageInput, StageSpec } from "../../contracts/stage.js";
import type { ThermalPath } from "../../domain/physics/thermal-path.js";
import type { StageModel } from "../../domain/stages/stage-model.js";
import type { CatalogPart, PartsCatalog } from "../context.js";
import { inputProblem } from "../input-problem.js";
import { toStageModel } from "./stage-model.js";
import { collectingFits, type FitNote, noteFit } from "../record/fit-notes.js";

/** A catalog part mapped once: its model, and the defaults and fits the mapping recorded (replayed on every use). */
interface MappedPart {
  readonly model: StageModel;
  readonly assumptions: readonly string[];
  readonly fits: readonly FitNote[];
}

/** Mapped models of catalog parts (immutable records), per part and request path. */
const catalogModels = new WeakMap<object, Map<string, MappedPart>>();

export interface ResolvedStage {
  readonly spec: StageSpec;
  readonly model: StageModel;
  readonly partId?: string;
  /** A catalog part's own datasheet-maximum corner (its catalog entry's datasheetMax). */
  readonly datasheetMax?: DatasheetMax;
}

/** The catalog's part of this id, or the `unknown-part` problem at `path`, with the nearest id ("did you mean"). */
export function catalogPart(catalog: PartsCatalog, id: string, path: (string | number)[]): CatalogPart {
  const part = catalog.find(id);
  if (part !== undefined) return part;
  const near = nearestName(
    id,
    catalog.list().map((p) => p.id),
  );
  throw inputProblem(
    "unknown-part",
    path,
    `no part "${id}" in the parts catalog${near === undefined ? "" : `; did you mean "${near}"?`}`,
  );
}

/**
 * A stage input (inline, or a catalog part by id) → its contract spec and domain model. The thermal
 * path is, in order: the request's override, the catalog reference's, the stage's own.
 */
export function resolveStage(
  input: StageInput,
  catalog: PartsCatalog,
  path: (string | number)[],
  assumptions: string[],
  thermalOverride?: ThermalPath,
): ResolvedStage {
  if (input.kind === "catalog-part") {
    const part = catalogPart(catalog, input.partId, [...path, "partId"]);
    if (thermalOverride === undefined && input.thermal === undefined) {
      // a catalog part with its own thermal path maps to the same model every time (the diode fit
      // included): map it once per path and replay the defaults it recorded
      const key = path.join("\u0000");
      const perPart = catalogModels.get(part) ?? new Map<string, MappedPart>();
      catalogModels.set(part, perPart);
      let hit = perPart.get(key);
      if (hit === undefined) {
        const recorded: string[] = [];
        const mapped = collectingFits(() => toStageModel(part.stage, part.stage.thermal, [...path], recorded));
        hit = { model: mapped.value, assumptions: recorded, fits: mapped.fits };
        if (perPart.size < 64) perPart.set(key, hit);
      }
      assumptions.push(...hit.assumptions);
      for (const f of hit.fits) noteFit(f);
      return { spec: part.stage, model: hit.model, partId: part.id, ...ownCorner(part) };
    }
    const thermal = thermalOverride ?? input.thermal ?? part.stage.thermal;
    return {
      spec: part.stage,
      model: toStageModel(part.stage, thermal, [...path], assumptions),
      partId: part.id,
      ...ownCorner(part),
    };
  }
  return { spec: input, model: toStageModel(input, thermalOverride ?? input.thermal, path, assumptions) };
}

const ownCorner = (part: CatalogPart): { datasheetMax?: DatasheetMax } =>
  part.datasheetMax === undefined ? {} : { datasheetMax: part.datasheetMax };
