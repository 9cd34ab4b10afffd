import { errorBodyOf } from "../../api/error-body.js";
import { httpStatusOf, type Invoke } from "../../api/procedure-registry.js";
import { LIMITS } from "../../contracts/limits.js";
import type { ErrorBody } from "../../contracts/outcome.js";

/** One analysis call's answer as every adapter sees it: a result, or an error body with its HTTP status. */
export type ItemResult =
  | { readonly ok: true; readonly result: unknown; readonly outcome: string; readonly seconds: number }
  | {
      readonly ok: false;
      readonly status: number;
      readonly error: ErrorBody;
      readonly outcome: string;
      readonly seconds: number;
      readonly internal?: string;
    };

const OUTCOME = /^[a-z][a-z0-9-]{0,39}$/;

/** A bounded metrics label for a result: its literal `outcome` if it has one, else "ok". */
export function outcomeLabel(result: unknown): string {
  const o = typeof result === "object" && result !== null ? (result as { outcome?: unknown }).outcome : undefined;
  return typeof o === "string" && OUTCOME.test(o) ? o : "ok";
}

/** Call one procedure of the in-process router; never rejects. */
export async function callOne(invoke: Invoke, input: unknown): Promise<ItemResult> {
  const t0 = performance.now();
  try {
    return succeeded(await invoke(input), t0);
  } catch (e) {
    return failed(e, t0);
  }
}

function succeeded(result: unknown, t0: number): ItemResult {
  return { ok: true, result, outcome: outcomeLabel(result), seconds: (performance.now() - t0) / 1000 };
}

function failed(e: unknown, t0: number): ItemResult {
  const error = errorBodyOf(e);
  const status = httpStatusOf(e);
  const seconds = (performance.now() - t0) / 1000;
  if (error.code === "internal") {
    const cause = (e as { cause?: unknown }).cause ?? e;
    return {
      ok: false,
      status,
      error,
      outcome: error.code,
      seconds,
      internal: cause instanceof Error ? (cause.stack ?? cause.message) : String(cause),
    };
  }
  return { ok: false, status, error, outcome: error.code, seconds };
}

/** An answer with its result already written out as JSON (what /v1 sends; text crosses threads cheaply). */
export type ItemJson =
  | { readonly ok: true; readonly json: string | undefined; readonly outcome: string; readonly seconds: number }
  | Extract<ItemResult, { ok: false }>;

/** {@link callOne}, the result written out as JSON (`JSON.stringify`, so the same bytes). */
export async function callOneJson(invoke: Invoke, input: unknown): Promise<ItemJson> {
  return asJson(await callOne(invoke, input));
}

function asJson(it: ItemResult): ItemJson {
  return it.ok ? { ok: true, json: JSON.stringify(it.result), outcome: it.outcome, seconds: it.seconds } : it;
}

/** The refusal of an answer past the answer limit (HTTP 422): how large it got, the limit and what to ask for instead. */
export function answerTooLarge(chars: number): Extract<ItemResult, { ok: false }> {
  const message = `the answer is ${chars} characters of JSON or more: at most ${LIMITS.maxAnswerBytes} (limit BACKSTOP_MAX_ANSWER_BYTES); ask for less in one request (fewer items, candidates or start-up profile points, no curves or waveform)`;
  return {
    ok: false,
    status: 422,
    error: { code: "answer-too-large", message, issues: [{ path: [], message }] },
    outcome: "answer-too-large",
    seconds: 0,
  };
}

/**
 * Answers written out, in order, until their JSON passes the answer limit: then the refusal in
 * place of the item that passed it, and no further item is answered (the whole request is refused).
 */
export async function boundedJsonAnswers(
  inputs: readonly unknown[],
  answer: (input: unknown) => Promise<ItemJson>,
): Promise<ItemJson[]> {
  const out: ItemJson[] = [];
  let chars = 0;
  for (const input of inputs) {
    const it = await answer(input);
    if (it.ok) chars += it.json?.length ?? 0;
    if (chars > LIMITS.maxAnswerBytes) {
      out.push(answerTooLarge(chars));
      break;
    }
    out.push(it);
  }
  return out;
}

/** The refusal among answers, if one passed the answer limit (see {@link boundedJsonAnswers}), counting the answers of every slice together. */
export function answerLimitHit(items: readonly ItemJson[]): Extract<ItemResult, { ok: false }> | undefined {
  let chars = 0;
  for (const it of items) {
    if (!it.ok && it.error.code === "answer-too-large") return it;
    if (it.ok) chars += it.json?.length ?? 0;
  }
  return chars > LIMITS.maxAnswerBytes ? answerTooLarge(chars) : undefined;
}
