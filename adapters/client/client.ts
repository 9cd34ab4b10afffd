import { createTRPCClient, httpLink, type TRPCClient } from "@trpc/client";
import type { AppRouter } from "../../api/router.js";

export type { AppRouter };

export interface BackstopClientOptions {
  /** where the service listens, e.g. "http://localhost:8080" (the client calls `<url>/trpc`) */
  readonly url: string;
  /** an API key of the server's BACKSTOP_API_KEYS, sent as `Authorization: Bearer <key>` (absent: no header) */
  readonly apiKey?: string | undefined;
  /** more request headers, e.g. an `x-request-id` to find the call in the server's log */
  readonly headers?: Readonly<Record<string, string>>;
}

/** A typed backstop client: every procedure of the router is `client.<name>.query(input)`, checked by the compiler. */
export type BackstopClient = TRPCClient<AppRouter>;

/**
 * The tRPC client of backstop (`import { createBackstopClient } from "backstop/client"`). Every call is
 * a POST (inputs can be long; the server allows the method override), one call a request, so an
 * error is that call's alone; the API key goes in the `Authorization` header (adapters/http/auth.ts).
 */
export function createBackstopClient(options: BackstopClientOptions): BackstopClient {
  const headers: Record<string, string> = { ...options.headers };
  if (options.apiKey !== undefined) headers.authorization = `Bearer ${options.apiKey}`;
  return createTRPCClient<AppRouter>({
    links: [
      httpLink({
        url: `${options.url.replace(/\/+$/, "")}/trpc`,
        methodOverride: "POST",
        headers,
      }),
    ],
  });
}
