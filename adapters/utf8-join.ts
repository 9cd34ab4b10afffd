/**
 * The UTF-8 bytes of `parts.join("")`, each part encoded straight into one buffer. Encoding the
 * joined text instead costs about ten times as much for the output chunks here (tens of kB to a
 * MB: the joined string is flattened, then scanned twice). Three bytes per UTF-16 unit bound every
 * code point's encoding (a surrogate pair is 4 bytes for 2 units, a lone surrogate 3 for 1).
 */
export function utf8Join(parts: readonly string[]): Buffer {
  let units = 0;
  for (const p of parts) units += p.length;
  const buf = Buffer.allocUnsafe(units * 3);
  let at = 0;
  for (const p of parts) at += buf.write(p, at, "utf8");
  return buf.subarray(0, at);
}
