import { createHash, timingSafeEqual } from "node:crypto";

const digest = (s: string) => createHash("sha256").update(s, "utf8").digest();

/**
 * A constant-time API-key check: the presented key and every accepted key are hashed to 32 bytes
 * and compared with `timingSafeEqual`, all of them every time (no early exit, no length leak).
 */
export function apiKeyChecker(keys: readonly string[]): (presented: string | undefined) => boolean {
  const hashes = keys.map(digest);
  return (presented) => {
    const h = digest(presented ?? "");
    let ok = false;
    for (const k of hashes) ok = timingSafeEqual(h, k) || ok;
    return ok && presented !== undefined;
  };
}

/** The key a request presents: `Authorization: Bearer <key>` or `X-API-Key: <key>`. */
export function presentedKey(authorization: string | undefined, xApiKey: string | undefined): string | undefined {
  const m = authorization === undefined ? null : /^Bearer\s+(\S+)\s*$/i.exec(authorization);
  return m?.[1] ?? xApiKey;
}
