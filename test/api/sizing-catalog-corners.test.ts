import { describe, expect, it } from "vitest";
import { procedureInvoker } from "../../adapters/batch/run-batch.js";
import { sizingCatalogOutput } from "../../contracts/sizing.js";
import { demoContext } from "../helpers/app.js";

// Each catalog part at its own datasheet-maximum corner (examples/catalog/demo-parts.json, invented
// values): the ideal diode at 1.4× Rds(on), the 12 mOhm P-FET at 1.25× (and Vth 1.5..2.5 V); the
// other parts carry none. The reference is the review of the same part at the same corner.
const ctx = demoContext();
const call = async (name: string, input: unknown) => {
  const f = procedureInvoker(ctx)(name);
  if (f === undefined) throw new Error(`${name} missing`);
  return f(input);
};
const requirement = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 6 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
  lossBudgetW: 2,
  standbyBudgetA: 0.0005,
};
const KINDS = ["nfet-ideal-diode", "pfet-high-side"];
type Review = { candidates: { verdict: string; worst: { lossW?: { value: number } } }[] };
const reviewLoss = async (partId: string, datasheetMax?: unknown) => {
  const r = (await call("review", {
    requirement,
    candidates: [{ stage: { kind: "catalog-part", partId }, ...(datasheetMax === undefined ? {} : { datasheetMax }) }],
  })) as Review;
  return { loss: r.candidates[0]?.worst.lossW?.value, verdict: r.candidates[0]?.verdict };
};
const own = (partId: string) => {
  const dm = ctx.catalog.find(partId)?.datasheetMax;
  if (dm === undefined) throw new Error(`${partId} carries no datasheetMax`);
  return dm;
};
const sized = async (datasheetMax?: unknown) =>
  sizingCatalogOutput.parse(
    await call("sizing.catalog", {
      requirement,
      kinds: KINDS,
      ...(datasheetMax === undefined ? {} : { datasheetMax }),
    }),
  );

describe("sizing.catalog: each part at its own datasheet-maximum corner", () => {
  it("two parts with different tolerances: each one's worst-case loss is the review's at its own corner", async () => {
    const out = await sized();
    const ideal = "demo-ideal-diode-60v-3mohm";
    const pfet = "demo-pfet-40v-12mohm";
    expect(own(ideal).rdsOnFactor).not.toBe(own(pfet).rdsOnFactor);
    for (const id of [ideal, pfet]) {
      const p = out.parts.find((x) => x.partId === id);
      const atOwn = await reviewLoss(id, own(id));
      const typical = await reviewLoss(id, { rdsOnFactor: 1, forwardVoltageFactor: 1 });
      expect(p?.worstLossW).toBe(atOwn.loss);
      // The review, too, takes the catalog part's own corner when the candidate gives none.
      expect((await reviewLoss(id)).loss).toBe(atOwn.loss);
      // The corner matters: the typical part loses less.
      expect((typical.loss ?? 0) < (atOwn.loss ?? 0)).toBe(true);
      expect(out.assumptions).toContain(
        `catalog.${id}: judged at its own datasheet-maximum corner (the catalog entry's datasheetMax)`,
      );
    }
    // A part without one is taken at typical values, said so.
    const plain = "demo-pfet-40v-9mohm-curves";
    expect(out.parts.find((x) => x.partId === plain)?.worstLossW).toBe((await reviewLoss(plain)).loss);
    expect(out.assumptions).toContain(
      `catalog.${plain}: its catalog entry carries no datasheetMax and the request gives none: judged at typical values only (no datasheet-maximum corner)`,
    );
  });

  it("the request's datasheetMax is the default for a part without its own; a part's own takes precedence", async () => {
    const dm = { rdsOnFactor: 2, forwardVoltageFactor: 1.3 };
    const out = await sized(dm);
    const plain = "demo-pfet-40v-9mohm-curves";
    expect(out.parts.find((x) => x.partId === plain)?.worstLossW).toBe((await reviewLoss(plain, dm)).loss);
    expect(out.assumptions).toContain(
      `catalog.${plain}: its catalog entry carries no datasheetMax: judged at the request's datasheetMax (the default for such parts)`,
    );
    const ideal = "demo-ideal-diode-60v-3mohm";
    expect(out.parts.find((x) => x.partId === ideal)?.worstLossW).toBe((await reviewLoss(ideal, own(ideal))).loss);
    expect(out.assumptions).toContain(
      `catalog.${ideal}: judged at its own datasheet-maximum corner (the catalog entry's datasheetMax); the request's datasheetMax is not applied to it`,
    );
  });

  it("a catalog entry's datasheetMax is strict, naming the field", async () => {
    const { catalogEntry } = await import("../../contracts/catalog.js");
    const entry = ctx.catalog.find("demo-pfet-40v-12mohm");
    const bad = catalogEntry.safeParse({
      ...entry,
      datasheetMax: { rdsOnFactor: 1.2, forwardVoltageFactor: 1, rdsOnMax: 2 },
    });
    expect(bad.success).toBe(false);
    expect(JSON.stringify(bad.error?.issues)).toContain("rdsOnMax");
    const low = catalogEntry.safeParse({ ...entry, datasheetMax: { rdsOnFactor: 0.9, forwardVoltageFactor: 1 } });
    expect(low.error?.issues[0]?.path).toEqual(["datasheetMax", "rdsOnFactor"]);
  });
});

describe("review: a catalog part at its own datasheet-maximum corner", () => {
  const ideal = "demo-ideal-diode-60v-3mohm";
  const review = async (candidate: Record<string, unknown>) =>
    (await call("review", {
      requirement,
      candidates: [{ stage: { kind: "catalog-part", partId: ideal }, ...candidate }],
    })) as {
      assumptions: string[];
      candidates: { worst: { lossW?: { value: number } } }[];
    };

  it("takes the catalog entry's datasheetMax when the candidate gives none, and says so", async () => {
    const r = await review({});
    expect(r.assumptions).toContain(
      `candidates.0.stage: judged at the catalog part's own datasheet-maximum corner (catalog ${ideal} datasheetMax)`,
    );
    const explicit = await review({ datasheetMax: own(ideal) });
    expect(r.candidates[0]?.worst.lossW?.value).toBe(explicit.candidates[0]?.worst.lossW?.value);
  });

  it("the candidate's own datasheetMax wins over the catalog part's, said so", async () => {
    const r = await review({ datasheetMax: { rdsOnFactor: 2, forwardVoltageFactor: 1 } });
    expect(r.assumptions).toContain(
      `candidates.0.stage: its own datasheetMax is used, not the catalog part's (catalog ${ideal})`,
    );
    const atOwn = await review({});
    expect((r.candidates[0]?.worst.lossW?.value ?? 0) > (atOwn.candidates[0]?.worst.lossW?.value ?? 0)).toBe(true);
  });
});

describe("sizing.spec: a catalog template at its own datasheet-maximum corner", () => {
  it("takes the catalog entry's datasheetMax when the template gives none: the same specification as the explicit corner", async () => {
    const ideal = "demo-ideal-diode-60v-3mohm";
    const spec = async (template: Record<string, unknown>) =>
      (await call("sizing.spec", {
        requirement,
        templates: [{ stage: { kind: "catalog-part", partId: ideal }, ...template }],
      })) as { assumptions: string[]; specifications: { items: unknown[] }[] };
    const implicit = await spec({});
    const explicit = await spec({ datasheetMax: own(ideal) });
    const typical = await spec({ datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1 } });
    expect(implicit.assumptions).toContain(
      `templates.0.stage: judged at the catalog part's own datasheet-maximum corner (catalog ${ideal} datasheetMax)`,
    );
    expect(implicit.specifications).toEqual(explicit.specifications);
    expect(implicit.specifications).not.toEqual(typical.specifications);
  });
});
