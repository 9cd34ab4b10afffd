import { TRPCError } from "@trpc/server";
import type { ErrorCode, Issue } from "../contracts/outcome.js";

/** An input the contracts accepted but the service cannot use (an unknown part id, an unfittable curve). */
export class InputProblem extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly issues: Issue[],
  ) {
    super(message);
    this.name = "InputProblem";
  }
}

export function inputProblem(code: ErrorCode, path: (string | number)[], message: string): TRPCError {
  return new TRPCError({ code: "BAD_REQUEST", message, cause: new InputProblem(code, message, [{ path, message }]) });
}
