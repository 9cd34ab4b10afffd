import { createHash, type Hash, hash } from "node:crypto";
import { RECORD_FORMAT, type VerdictRecord } from "../../contracts/record.js";
import type { RuleSetStamp } from "../../domain/rules/rule-model.js";
import { canonicalJson, canonicalJsonPieces } from "../../domain/rules/rule-set-hash.js";
import type { CatalogPart, Context } from "../context.js";
import { buildVersion } from "./build-version.js";
import type { FitNote } from "./fit-notes.js";

/**
 * SHA-256 of a value's canonical JSON (domain/rules/rule-set-hash.ts), `sha256:` prefixed. node's
 * one-shot `hash` for a text of one piece (no Hash object a digest; Node >= 20.12, "release candidate" in the Node 20 and
 * 22 docs, meant for data up to 5 MB that is at hand, as a record's texts are): about 0.35 µs less
 * than createHash on each of a record's texts of 0.2-1 kB (bench/record-cost.ts, Node 20.20).
 */
export function sha256Of(value: unknown): string {
  // a text of one piece (most inputs and results) in one shot; a longer one (a review's answer)
  // piece by piece into a Hash, so that its whole text is never held (the soak's memory)
  let first: string | undefined;
  let h: Hash | undefined;
  canonicalJsonPieces(value, (piece) => {
    if (first === undefined && h === undefined) first = piece;
    else {
      h ??= createHash("sha256").update(first as string);
      h.update(piece);
    }
  });
  return `sha256:${h === undefined ? hash("sha256", first ?? "", "hex") : h.digest("hex")}`;
}

/** The text a record's signature is over: the canonical JSON of the record without `signature`. */
export function signedText(record: Readonly<Record<string, unknown>>): string {
  const { signature: _, ...body } = record;
  return canonicalJson(body);
}

/** A result without its record: what `resultSha256` is the digest of. */
export function withoutRecord(result: Readonly<Record<string, unknown>>): Record<string, unknown> {
  const { record: _, ...rest } = result;
  return rest;
}

const byText = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/**
 * The digest of a catalog part's canonical JSON, computed once a part (parts are immutable records;
 * the entries go with their catalog). Hashing a part's data on every call cost about 30 µs of an
 * operating point's 65 µs of record digests (docs/performance.md, "The verdict record's cost").
 */
const partDigests = new WeakMap<CatalogPart, string>();
function partDigest(p: CatalogPart): string {
  let d = partDigests.get(p);
  if (d === undefined) {
    d = sha256Of(p);
    partDigests.set(p, d);
  }
  return d;
}

/** One call being recorded: the context its handler runs with, and the seal that adds the record. */
export interface CallRecording {
  readonly ctx: Context;
  /** `result` with its verdict record last, where it carries `modelVersion` (an analysis); else `result` as it is. */
  seal(procedure: string, sent: unknown, input: unknown, result: unknown, fits: readonly FitNote[]): unknown;
}

/**
 * Record one call: its handler gets `ctx` with the catalog's `find` noting every part it returns
 * and `uses` noting every rule set resolved (api/map/rule-set.ts). Nothing outlives the call.
 */
export function recordCall(base: Context): CallRecording {
  const catalog = base.catalog;
  const parts = new Map<string, CatalogPart>();
  const sets = new Map<string, RuleSetStamp>();
  const ctx: Context = {
    ...base,
    catalog: {
      find: (id) => {
        const p = catalog.find(id);
        if (p !== undefined) parts.set(p.id, p);
        return p;
      },
      list: () => catalog.list(),
      stamp: catalog.stamp,
    },
    uses: { ruleSet: (s) => sets.set(`${s.id}\u0000${s.version}\u0000${s.hash}`, s) },
  };
  return {
    ctx,
    seal(procedure, sent, input, result, fits) {
      if (typeof result !== "object" || result === null || Array.isArray(result)) return result;
      const r = result as Record<string, unknown>;
      if (typeof r.modelVersion !== "string") return result;
      const used = [...parts.values()].sort((a, b) => byText(a.id, b.id));
      const body: Omit<VerdictRecord, "signature"> = {
        format: RECORD_FORMAT,
        procedure,
        sentSha256: sha256Of(sent),
        inputSha256: sha256Of({ input, parts: used.map((p) => ({ id: p.id, sha256: partDigest(p) })) }),
        resultSha256: sha256Of(r),
        ruleSets: [...sets.keys()].sort(byText).map((k) => {
          const s = sets.get(k) as RuleSetStamp;
          return { id: s.id, version: s.version, hash: s.hash };
        }),
        ...(used.length === 0 ? {} : { catalog: { ...catalog.stamp }, parts: used.map((p) => p.id) }),
        ...(fits.length === 0 ? {} : { fits: fits.map((f) => ({ ...f })) }),
        modelVersion: r.modelVersion,
        buildVersion: buildVersion(),
      };
      const signer = base.recordSigner;
      const record: VerdictRecord =
        signer === undefined
          ? body
          : { ...body, signature: { alg: "Ed25519", keyId: signer.keyId, value: signer.sign(canonicalJson(body)) } };
      return { ...r, record };
    },
  };
}
