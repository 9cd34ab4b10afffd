import { createHash, createPrivateKey, createPublicKey, type KeyObject, sign, verify } from "node:crypto";
import { readFileSync } from "node:fs";
import type { RecordSigner } from "../../api/context.js";

/**
 * The verdict records' signing key from the environment, as PEM text: BACKSTOP_RECORD_KEY_FILE (a
 * file holding an Ed25519 private key, PKCS#8 PEM) or BACKSTOP_RECORD_KEY (the PEM itself); neither:
 * undefined (records unsigned); both, an unreadable file or a key that is not Ed25519: an error
 * naming the variable.
 */
export function recordKeyFromEnv(env: NodeJS.ProcessEnv = process.env): string | undefined {
  const file = env.BACKSTOP_RECORD_KEY_FILE;
  const text = env.BACKSTOP_RECORD_KEY;
  const hasFile = file !== undefined && file !== "";
  const hasText = text !== undefined && text !== "";
  if (hasFile && hasText) throw new Error("set BACKSTOP_RECORD_KEY_FILE or BACKSTOP_RECORD_KEY, not both");
  if (!hasFile && !hasText) return undefined;
  let pem: string;
  try {
    pem = hasFile ? readFileSync(file, "utf8") : (text as string);
  } catch (e) {
    throw new Error(`BACKSTOP_RECORD_KEY_FILE: cannot read ${file}: ${(e as Error).message}`);
  }
  recordSignerOf(pem, hasFile ? "BACKSTOP_RECORD_KEY_FILE" : "BACKSTOP_RECORD_KEY");
  return pem;
}

/** `sha256:` and the hex SHA-256 of a public key's SPKI DER: the key id a signature names. */
export function keyIdOf(publicKey: KeyObject): string {
  return `sha256:${createHash("sha256")
    .update(publicKey.export({ type: "spki", format: "der" }))
    .digest("hex")}`;
}

/**
 * A signer of verdict records from an Ed25519 private key (PKCS#8 PEM): Ed25519 signatures
 * (RFC 8032, through node:crypto; deterministic, so the same record gets the same signature).
 * `source` names where the key came from in the error for a key that is not one.
 */
export function recordSignerOf(pem: string, source = "the record key"): RecordSigner {
  let privateKey: KeyObject;
  try {
    privateKey = createPrivateKey({ key: pem, format: "pem" });
  } catch (e) {
    throw new Error(`${source}: not a private key in PEM (PKCS#8): ${(e as Error).message}`);
  }
  if (privateKey.asymmetricKeyType !== "ed25519")
    throw new Error(
      `${source}: an Ed25519 key is needed, got ${privateKey.asymmetricKeyType ?? "a secret key"} (openssl genpkey -algorithm ed25519)`,
    );
  const publicKey = createPublicKey(privateKey);
  return {
    keyId: keyIdOf(publicKey),
    publicKeyPem: publicKey.export({ type: "spki", format: "pem" }).toString(),
    sign: (text) => sign(null, Buffer.from(text, "utf8"), privateKey).toString("base64"),
    verify: (text, signatureBase64) =>
      verify(null, Buffer.from(text, "utf8"), publicKey, Buffer.from(signatureBase64, "base64")),
  };
}
