import { z } from "zod";

/** A SHA-256 digest as the service writes every hash: `sha256:` and 64 lowercase hex digits. */
const sha256Digest = z.string().regex(/^sha256:[0-9a-f]{64}$/);

const ruleSetStamp = z.object({ id: z.string(), version: z.string(), hash: z.string() });
const catalogStamp = z.object({ id: z.string(), hash: z.string(), partCount: z.number().int() });

/** A least-squares curve fit the call made (api/map/fit-gate.ts): where, and how well it follows its points. */
const fitNote = z.object({
  path: z.string().meta({ description: "where the points are in the input (stage.diode.points)" }),
  unit: z.string().meta({ description: "the unit of the residuals (V, ohm, K/W, A)" }),
  points: z.number().int(),
  rmsResidual: z.number(),
  worstResidual: z.number().meta({ description: "model - point at the worst point, in unit" }),
  worstPoint: z.number().int().meta({ description: "index of the worst point in the caller's order" }),
  worstFraction: z.number().meta({ description: "|worstResidual| / |point|" }),
  boundFraction: z.number().meta({ description: "the fit's bound on worstFraction" }),
  accepted: z.boolean().meta({ description: "beyond its bound, taken because the caller set acceptFit" }),
});

/** The record's format tag: a change of what the digests cover or how the body is signed gets a new one. */
export const RECORD_FORMAT = "backstop-record/1";

/**
 * The verdict record on every analysis result, computed once for every call (api/record/). Digests
 * are SHA-256 of canonical JSON (keys sorted at every level, no whitespace); the signature, with a
 * signing key configured, is Ed25519 over the canonical JSON of the record without `signature`.
 */
export const verdictRecord = z
  .object({
    format: z.literal(RECORD_FORMAT),
    procedure: z.string().meta({ description: "the procedure that answered" }),
    sentSha256: sha256Digest.meta({ description: "digest of the input as the caller sent it" }),
    inputSha256: sha256Digest.meta({
      description:
        "digest of the input as the service understood it: { input: the contract-parsed input (defaults applied), parts: [{ id, sha256 of the part's canonical JSON }] for every catalog part the call used, sorted by id }",
    }),
    resultSha256: sha256Digest.meta({ description: "digest of this result without its record" }),
    ruleSets: z
      .array(ruleSetStamp)
      .meta({ description: "every rule set the call evaluated (id, version, hash), in id order" }),
    catalog: catalogStamp
      .optional()
      .meta({ description: "the parts catalog's stamp (present when a part of it was used)" }),
    parts: z.array(z.string()).optional().meta({ description: "ids of the catalog parts used, sorted (with catalog)" }),
    fits: z
      .array(fitNote)
      .optional()
      .meta({ description: "every least-squares curve fit the call made, in the order made (present when one was)" }),
    modelVersion: z.string(),
    buildVersion: z.string().meta({ description: "the service's package version, `+` its build id where one was set" }),
    signature: z
      .object({
        alg: z.literal("Ed25519"),
        keyId: sha256Digest.meta({
          description: "digest of the public key's DER (SPKI); GET /v1/record-key serves it",
        }),
        value: z.string().meta({ description: "the signature, base64" }),
      })
      .optional()
      .meta({
        description: "present when the service has a signing key (BACKSTOP_RECORD_KEY_FILE or BACKSTOP_RECORD_KEY)",
      }),
  })
  .meta({ description: "what the result was computed from, and its digest; see README, Verdict records" });
export type VerdictRecord = z.infer<typeof verdictRecord>;
