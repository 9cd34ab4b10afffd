import type { Invoke } from "../../api/procedure-registry.js";
import { LIMITS } from "../../contracts/limits.js";
import { type ReportFormat, reportBody } from "../report/report-body.js";
import { answerTooLarge, callOne, type ItemResult } from "./call.js";

/** A report request: the procedure, its input (chart data asked for), the format and the report's id. */
export interface ReportTask {
  readonly procedure: string;
  readonly input: unknown;
  readonly format: ReportFormat;
  readonly id: string | number | undefined;
}

/** A report's text, or the error of the call or of the drawing (with its HTTP status). */
export type ReportAnswer = { readonly ok: true; readonly text: string } | Extract<ItemResult, { ok: false }>;

/**
 * The call and its report together (a compute thread runs both, so neither holds the request
 * thread); a result that cannot be drawn is a 422 `report-failed`, a text past the answer limit a
 * 422 `answer-too-large`. Never throws.
 */
export async function reportAnswer(invoke: Invoke, task: ReportTask): Promise<ReportAnswer> {
  const it = await callOne(invoke, task.input);
  if (!it.ok) return it;
  const body = reportBody(task.procedure, it.result, task.format, task.id);
  if (!body.ok) return { ok: false, status: 422, error: body.error, outcome: body.error.code, seconds: it.seconds };
  if (body.text.length > LIMITS.maxAnswerBytes) return answerTooLarge(body.text.length);
  return { ok: true, text: body.text };
}
