/** The `paths`/`components` types of the OpenAPI document at `url` (a file: or http: URL), as TypeScript source. */
export function openApiTypes(url: URL | string): Promise<string>;
