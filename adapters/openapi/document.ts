import { committedText, openApiDocument } from "../../api/openapi.js";
import { REPORT_RENDERERS } from "../report/report-body.js";
import { requestExamples } from "./request-examples.js";

/** The OpenAPI document of this service: its procedures, their examples, the report routes. */
export const serviceOpenApi = () =>
  openApiDocument({ examples: requestExamples(), reports: Object.keys(REPORT_RENDERERS).sort() });

/** As served at /openapi.json: compact JSON (less than half the bytes of the committed form). */
export const servedOpenApiText = (): string => JSON.stringify(serviceOpenApi());

/** As committed in contracts/openapi.json (`npm run openapi`): indented, for readable diffs. */
export const committedOpenApiText = (): string => committedText(serviceOpenApi());
