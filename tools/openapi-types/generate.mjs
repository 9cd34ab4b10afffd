// TypeScript types of an OpenAPI document, written by openapi-typescript (its own TypeScript 5
// resolves from this folder; see package.json).
import openapiTS, { astToString } from "openapi-typescript";

/** The `paths`/`components` types of the OpenAPI document at `url` (a file: or http: URL), as TypeScript source. */
export async function openApiTypes(url) {
  return astToString(await openapiTS(url));
}
