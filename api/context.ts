import type { DatasheetMax } from "../contracts/datasheet-max.js";
import type { StageSpec } from "../contracts/stage.js";
import type { RuleSetStamp } from "../domain/rules/rule-model.js";
import type { RuleSetStore } from "../domain/rules/rule-set-store.js";

/** A part of the approved-parts catalog: a stage with an id. */
export interface CatalogPart {
  readonly id: string;
  readonly description: string;
  readonly stage: StageSpec;
  /** The part's own datasheet-maximum corner, where the catalog gives one. */
  readonly datasheetMax?: DatasheetMax | undefined;
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

/**
 * The key that signs verdict records (Ed25519; adapters/record/signing-key.ts loads it): its id
 * (`sha256:` of the public key's SPKI DER), the public key as PEM, and sign/verify of a text's
 * UTF-8 bytes with the signature as base64.
 */
export interface RecordSigner {
  readonly keyId: string;
  readonly publicKeyPem: string;
  sign(text: string): string;
  verify(text: string, signatureBase64: string): boolean;
}

/** What one call tells its verdict record as it resolves it (set per call by the call definition). */
export interface CallUses {
  ruleSet(stamp: RuleSetStamp): void;
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
  /** optional: the key that signs every verdict record (absent: records are unsigned) */
  readonly recordSigner?: RecordSigner | undefined;
  /** set by the call definition for one call: where the rule sets it resolves are noted (api/record/) */
  readonly uses?: CallUses | undefined;
}
