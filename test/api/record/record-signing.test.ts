import { createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify } from "node:crypto";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { createApp } from "../../../adapters/http/app.js";
import { createLogger } from "../../../adapters/logging/logger.js";
import { keyIdOf, recordKeyFromEnv, recordSignerOf } from "../../../adapters/record/signing-key.js";
import { callProcedure, procedureInvoker } from "../../../api/procedure-registry.js";
import { canonicalJson } from "../../../domain/rules/rule-set-hash.js";
import { verdictRecord } from "../../../contracts/record.js";
import type { VerifyOutput } from "../../../contracts/verify.js";
import { demoContext } from "../../helpers/app.js";
import example from "../../../examples/requests/operatingPoint.json" with { type: "json" };

const pemOf = () => generateKeyPairSync("ed25519").privateKey.export({ type: "pkcs8", format: "pem" }).toString();
type Rec = Record<string, unknown>;

// RFC 8032 section 7.1, TEST 1 (empty message) and TEST 2 (one octet 0x72): secret key, public key,
// signature (docs/references.md, "Verdict records"; the vectors confirmed against a copy of the RFC's test data)
const RFC8032 = [
  {
    secret: "9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60",
    public: "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a",
    message: "",
    signature:
      "e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46bd25bf5f0595bbe24655141438e7a100b",
  },
  {
    secret: "4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb",
    public: "3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c",
    message: "72",
    signature:
      "92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613d0f11d8c387b2eaeb4302aeeb00d291612bb0c00",
  },
];
// DER headers of an Ed25519 key (RFC 8410): PKCS#8 private key around the 32-byte seed, SPKI around the public key
const PKCS8_PREFIX = "302e020100300506032b657004220420";
const SPKI_PREFIX = "302a300506032b6570032100";

describe("Ed25519 through node:crypto: RFC 8032 known answers", () => {
  it.each(RFC8032)("TEST vector with public key $public", (v) => {
    const priv = createPrivateKey({ key: Buffer.from(PKCS8_PREFIX + v.secret, "hex"), format: "der", type: "pkcs8" });
    const pub = createPublicKey(priv);
    expect(Buffer.from(pub.export({ type: "spki", format: "der" })).toString("hex")).toBe(SPKI_PREFIX + v.public);
    const msg = Buffer.from(v.message, "hex");
    expect(sign(null, msg, priv).toString("hex")).toBe(v.signature);
    expect(verify(null, msg, pub, Buffer.from(v.signature, "hex"))).toBe(true);
    // the signer the service uses, over a text: the RFC message as its UTF-8 (both vectors are ASCII)
    const signer = recordSignerOf(priv.export({ type: "pkcs8", format: "pem" }).toString());
    const text = msg.toString("utf8");
    expect(Buffer.from(signer.sign(text), "base64").toString("hex")).toBe(v.signature);
    expect(signer.verify(text, Buffer.from(v.signature, "hex").toString("base64"))).toBe(true);
    expect(signer.keyId).toBe(keyIdOf(pub));
  });
});

describe("signed verdict records", () => {
  const pem = pemOf();
  const signer = recordSignerOf(pem);
  const ctx = { ...demoContext(), recordSigner: signer };
  const result = callProcedure("operatingPoint", ctx, example.input) as Rec;
  const record = verdictRecord.parse(result.record);
  const verifyOne = async (c: typeof ctx | ReturnType<typeof demoContext>, r: Rec, input: unknown = example.input) => {
    const verify = procedureInvoker(c)("verify");
    if (verify === undefined) throw new Error("no verify procedure");
    const out = (await verify({ records: [{ procedure: "operatingPoint", input, result: r }] })) as VerifyOutput;
    return out.reports[0];
  };

  it("the signature is Ed25519 over the record's canonical body, checked by node:crypto with the public key alone", () => {
    expect(record.signature?.alg).toBe("Ed25519");
    expect(record.signature?.keyId).toBe(signer.keyId);
    const { signature, ...body } = record;
    const ok = verify(
      null,
      Buffer.from(canonicalJson(body), "utf8"),
      createPublicKey(signer.publicKeyPem),
      Buffer.from(signature?.value ?? "", "base64"),
    );
    expect(ok).toBe(true);
    // deterministic: the same call signs the same bytes
    expect(JSON.stringify(callProcedure("operatingPoint", ctx, example.input))).toBe(JSON.stringify(result));
  });

  it("round trip: verify says valid; a changed signature or a changed record fails; another key is unknown", async () => {
    expect(await verifyOne(ctx, result)).toMatchObject({ status: "unchanged", signature: "valid" });
    const value = record.signature?.value ?? "";
    const flipped = `${value.slice(0, 10)}${value[10] === "A" ? "B" : "A"}${value.slice(11)}`;
    const badSig = { ...result, record: { ...record, signature: { ...record.signature, value: flipped } } };
    expect(await verifyOne(ctx, badSig)).toMatchObject({ status: "signature-failed", signature: "invalid" });
    const badBody = { ...result, record: { ...record, buildVersion: "9.9.9" } };
    expect(await verifyOne(ctx, badBody)).toMatchObject({ status: "signature-failed", signature: "invalid" });
    const other = { ...demoContext(), recordSigner: recordSignerOf(pemOf()) };
    expect(await verifyOne(other, result)).toMatchObject({ status: "signature-failed", signature: "unknown-key" });
    expect(await verifyOne(demoContext(), result)).toMatchObject({ signature: "unknown-key" });
  });

  it("an unsigned record checked by a service with a key: said unsigned, and checked by its digests", async () => {
    const unsigned = callProcedure("operatingPoint", demoContext(), example.input) as Rec;
    expect(await verifyOne(ctx, unsigned)).toMatchObject({ status: "unchanged", signature: "unsigned" });
  });

  it("GET /v1/record-key serves the public key and its id; without a key, 404", async () => {
    const logger = createLogger("silent");
    const res = await createApp({ ctx, logger }).request("/v1/record-key");
    expect(res.status).toBe(200);
    const body = (await res.json()) as { alg: string; keyId: string; publicKeyPem: string };
    expect(body).toEqual({ alg: "Ed25519", keyId: signer.keyId, publicKeyPem: signer.publicKeyPem });
    expect(keyIdOf(createPublicKey(body.publicKeyPem))).toBe(body.keyId);
    expect((await createApp({ ctx: demoContext(), logger }).request("/v1/record-key")).status).toBe(404);
  });
});

describe("the signing key's configuration", () => {
  const pem = pemOf();
  const file = join(mkdtempSync(join(tmpdir(), "backstop-key-")), "record-key.pem");
  writeFileSync(file, pem);

  it("from a file or from the variable; none: unsigned", () => {
    expect(recordKeyFromEnv({ BACKSTOP_RECORD_KEY_FILE: file })).toBe(pem);
    expect(recordKeyFromEnv({ BACKSTOP_RECORD_KEY: pem })).toBe(pem);
    expect(recordKeyFromEnv({})).toBeUndefined();
  });

  it("both, an unreadable file, not a key, or not Ed25519: an error naming the variable", () => {
    expect(() => recordKeyFromEnv({ BACKSTOP_RECORD_KEY_FILE: file, BACKSTOP_RECORD_KEY: pem })).toThrow(/not both/);
    expect(() => recordKeyFromEnv({ BACKSTOP_RECORD_KEY_FILE: `${file}.missing` })).toThrow(
      /BACKSTOP_RECORD_KEY_FILE: cannot read/,
    );
    expect(() => recordKeyFromEnv({ BACKSTOP_RECORD_KEY: "not a key" })).toThrow(
      /BACKSTOP_RECORD_KEY: not a private key/,
    );
    const rsa = generateKeyPairSync("rsa", { modulusLength: 1024 }).privateKey.export({ type: "pkcs8", format: "pem" });
    expect(() => recordKeyFromEnv({ BACKSTOP_RECORD_KEY: rsa.toString() })).toThrow(
      /an Ed25519 key is needed, got rsa/,
    );
  });
});
