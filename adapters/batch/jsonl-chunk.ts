import type { Readable } from "node:stream";
import { MAX_LINE_CHARS } from "./line.js";

/**
 * A run of whole JSON Lines input lines as bytes, with the number of its first line and how many
 * lines it holds; or one line too long to answer, whose bytes were not kept (`overlongBytes`: its
 * length with its break, `bytes` empty).
 */
export interface JsonlChunk {
  readonly bytes: Uint8Array;
  readonly firstLine: number;
  readonly lines: number;
  readonly overlongBytes?: number;
}

/**
 * Lines of more bytes than this are not held in memory: UTF-8 takes at most three bytes per UTF-16
 * unit, so such a line has more than MAX_LINE_CHARS units and `processLine` would reject it by its
 * length (a line of whitespace alone it would call empty: past this size it too is "longer than").
 * Without the bound, a file with no line break (a binary file given by mistake) was held whole and
 * failed the run when it could not be decoded to one string.
 */
export const MAX_LINE_BYTES = 3 * MAX_LINE_CHARS;

const LF = 0x0a;
const CR = 0x0d;

/**
 * Line breaks as `readline` reads them with `crlfDelay: Infinity`: `\r\n`, `\n`, or a `\r` not
 * followed by `\n`. `linesOf` splits a chunk's text the same way; the last piece is dropped when empty
 * (the chunk ended with a break, or is empty), as readline yields no line after a final break.
 */
const BREAK = /\r?\n|\r(?!\n)/;

export function linesOf(text: string): string[] {
  // without a \r every break is a \n: a split on the character (about a third of the regex's time)
  const parts = text.includes("\r") ? text.split(BREAK) : text.split("\n");
  if (parts[parts.length - 1] === "") parts.pop();
  return parts;
}

/** The number of lines `linesOf` finds in these bytes (UTF-8: the bytes `\r` and `\n` are only ever those characters). */
export function lineCountOf(bytes: Uint8Array): number {
  if (bytes.length === 0) return 0;
  let breaks = 0;
  for (let at = bytes.indexOf(LF); at >= 0; at = bytes.indexOf(LF, at + 1)) breaks += 1;
  for (let at = bytes.indexOf(CR); at >= 0; at = bytes.indexOf(CR, at + 1)) if (bytes[at + 1] !== LF) breaks += 1;
  const last = bytes[bytes.length - 1];
  return last === LF || last === CR ? breaks : breaks + 1;
}

/**
 * Where a chunk that must hold at least the bytes before `from` may end in `bytes`: just after the
 * first line break that ends at or after `from` (a `\n`, or a `\r` whose next byte is known not to
 * be `\n`, so a `\r\n` is never split), or -1 when no break can be placed yet.
 */
export function cutAfter(bytes: Uint8Array, from: number): number {
  const lf = bytes.indexOf(LF, from);
  const cr = (lf < 0 ? bytes : bytes.subarray(0, lf)).indexOf(CR, from);
  if (cr < 0) return lf < 0 ? -1 : lf + 1;
  if (cr + 1 >= bytes.length) return -1; // the byte after the \r has not been read yet
  return bytes[cr + 1] === LF ? cr + 2 : cr + 1;
}

/**
 * The input cut into chunks of whole lines of at least `targetBytes` each (a chunk ends just after
 * a line break, so a `\r\n` is never split and a multi-byte character never is; the last chunk
 * takes what is left). A large piece of input gives several chunks, so the reader may read far
 * ahead; a chunk is a view into the piece it came from. A line of more than `maxLineBytes` bytes
 * (its break not counted; at least `targetBytes`) comes as a chunk of its own with `overlongBytes`
 * and no bytes: its bytes are counted and dropped as they are read. Only the bytes are looked at here: decoding, parsing and answering happen where the
 * chunk is answered (a worker thread, or this thread).
 */
export async function* jsonlChunks(
  input: Readable,
  targetBytes: number,
  maxLineBytes = MAX_LINE_BYTES,
): AsyncGenerator<JsonlChunk> {
  const target = Math.max(1, targetBytes);
  // at least the target: a remainder longer than this then holds no break past target − 1 (see below)
  const cap = Math.max(maxLineBytes, target);
  let pending: Buffer[] = [];
  let pendingBytes = 0;
  let firstLine = 1;
  // an overlong line being read past: its bytes so far, and whether they end in a \r (its break,
  // the next byte deciding whether a \n belongs to it)
  let skipping: { bytes: number; crAtEnd: boolean } | undefined;
  const cut = (bytes: Uint8Array): JsonlChunk => {
    const lines = lineCountOf(bytes);
    const c = { bytes, firstLine, lines };
    firstLine += lines;
    return c;
  };
  const overlong = (bytes: number): JsonlChunk => {
    const c = { bytes: new Uint8Array(0), firstLine, lines: 1, overlongBytes: bytes };
    firstLine += 1;
    return c;
  };
  // whole lines as chunks; a chunk longer than the cap may hold an overlong line, which goes alone
  const emit = function* (bytes: Uint8Array): Generator<JsonlChunk> {
    if (bytes.length <= cap) {
      yield cut(bytes);
      return;
    }
    let run = 0;
    for (let at = 0; at < bytes.length; ) {
      const found = cutAfter(bytes, at);
      const end = found < 0 ? bytes.length : found; // the last line: no break, or a final \r
      if (end - at - breakBytesBefore(bytes, at, end) > cap) {
        if (at > run) yield cut(bytes.subarray(run, at));
        yield overlong(end - at);
        run = end;
      }
      at = end;
    }
    if (run < bytes.length) yield cut(bytes.subarray(run));
  };
  for await (const read of input as AsyncIterable<Buffer | string>) {
    // a stream of text (Readable.from a string) as its UTF-8 bytes
    let piece = typeof read === "string" ? Buffer.from(read, "utf8") : read;
    if (skipping !== undefined) {
      const end = skipping.crAtEnd ? (piece[0] === LF ? 1 : 0) : cutAfter(piece, 0);
      if (end < 0) {
        skipping.bytes += piece.length;
        skipping.crAtEnd = piece[piece.length - 1] === CR;
        continue;
      }
      yield overlong(skipping.bytes + end);
      skipping = undefined;
      piece = piece.subarray(end);
      if (piece.length === 0) continue;
    }
    pending.push(piece);
    pendingBytes += piece.length;
    if (pendingBytes < target) continue;
    // no break in this piece: nothing new to cut at (and no copy of what is pending for each piece
    // of a long line), unless what is pending has grown past the longest line
    if (pending.length > 1 && pendingBytes <= cap && piece.indexOf(LF) < 0 && piece.indexOf(CR) < 0) continue;
    let all = pending.length === 1 ? piece : Buffer.concat(pending, pendingBytes);
    for (let end = cutAfter(all, target - 1); end > 0; end = cutAfter(all, target - 1)) {
      yield* emit(all.subarray(0, end));
      all = all.subarray(end);
      if (all.length < target) break;
    }
    if (all.length > cap) {
      // No break past target − 1 (the loop above stopped there), but perhaps a final \r: the last
      // line starts after the last break before it. Longer than the cap, the complete lines
      // before it go as a chunk and the rest of it is read past.
      const start = lastLineStart(all);
      const content = all.length - start - (all[all.length - 1] === CR ? 1 : 0);
      if (content > cap) {
        if (start > 0) yield* emit(all.subarray(0, start));
        skipping = { bytes: all.length - start, crAtEnd: all[all.length - 1] === CR };
        all = all.subarray(all.length);
      }
    }
    pending = all.length > 0 ? [all] : [];
    pendingBytes = all.length;
  }
  if (skipping !== undefined) yield overlong(skipping.bytes);
  else if (pendingBytes > 0)
    yield* emit(pending.length === 1 ? (pending[0] as Buffer) : Buffer.concat(pending, pendingBytes));
}

/** The bytes of the break that ends the line bytes[at, end) (0 for a last line without one). */
function breakBytesBefore(bytes: Uint8Array, at: number, end: number): number {
  const last = bytes[end - 1];
  if (end <= at || (last !== LF && last !== CR)) return 0;
  return last === LF && end - 2 >= at && bytes[end - 2] === CR ? 2 : 1;
}

/**
 * Where the last line of `bytes` starts: just after the last break that is not the final byte (a
 * final \r ends the line but may yet be followed by its \n), or 0.
 */
function lastLineStart(bytes: Uint8Array): number {
  const upTo = bytes.length - 2; // a break at the final byte does not start a line within these bytes
  if (upTo < 0) return 0;
  return Math.max(bytes.lastIndexOf(LF, upTo), bytes.lastIndexOf(CR, upTo)) + 1;
}
