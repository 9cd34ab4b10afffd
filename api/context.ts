import type { StageSpec } from "../contracts/stage.js";
import type { RuleSetStore } from "../domain/rules/rule-set-store.js";

/** A part of the approved-parts catalog: a stage with an id. */
export interface CatalogPart {
  readonly id: string;
  readonly description: string;
  readonly stage: StageSpec;
}

/**
 * What identifies the catalog data a result used: the catalog's name, the sha256 of its parts'
 * canonical JSON (sorted by id, `sha256:` prefixed) and how many parts it holds.
 */
export interface CatalogStamp {
  readonly id: string;
  readonly hash: string;
  readonly partCount: number;
}

/** Port: where parts come from (a file in the demo; a PLM export in production). */
export interface PartsCatalog {
  find(id: string): CatalogPart | undefined;
  list(): readonly CatalogPart[];
  readonly stamp: CatalogStamp;
}

/** What an adapter learns of each procedure call (for metrics); `outcome` is the result's or the error code. */
export interface ProcedureObservation {
  readonly path: string;
  readonly ok: boolean;
  readonly data?: unknown;
  readonly error?: unknown;
  readonly seconds: number;
}

export interface Context {
  readonly catalog: PartsCatalog;
  /** Rule sets requests may name; absent: the built-in sets only. */
  readonly ruleSets?: RuleSetStore | undefined;
  /** optional observer of every procedure call (the HTTP adapter's metrics) */
  readonly observe?: ((o: ProcedureObservation) => void) | undefined;
  /**
   * optional: where a /trpc call runs instead of here (the HTTP server's compute threads, under its
   * compute budget, `adapters/http/trpc-offload.ts`), given the input as the client sent it: the
   * call's result, or a rejection with the error to answer; undefined: here (`runProcedure`)
   */
  readonly offload?: ((path: string, rawInput: unknown) => Promise<unknown> | undefined) | undefined;
}
