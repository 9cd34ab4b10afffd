/**
 * mathjs's single-file build (the same package and version as "mathjs"). Loading it takes one file
 * instead of the ~900 modules of the ESM entry, whose import also builds every function eagerly:
 * ~0.15 s instead of ~1.5 s of start-up on a loaded 2-core machine (bench/results.json, start-up).
 */
declare module "mathjs/lib/browser/math.js" {
  /** the default instance; its `create` is bound to the full factory set (a fresh instance) */
  const mathjs: Omit<typeof import("mathjs"), "create"> & { create(config?: import("mathjs").ConfigOptions): import("mathjs").MathJsInstance };
  export default mathjs;
}
