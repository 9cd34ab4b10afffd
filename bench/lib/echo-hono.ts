/** Bench baseline: a bare Hono route on @hono/node-server answering a JSON echo of the body (parse + re-serialise). */
import { serve } from "@hono/node-server";
import { Hono } from "hono";

const app = new Hono();
app.post("/echo", async (c) =>
  c.body(JSON.stringify(JSON.parse(await c.req.text())), 200, { "content-type": "application/json" }),
);
serve({ fetch: app.fetch, port: 0, hostname: "127.0.0.1" }, (info) =>
  process.stdout.write(`listening on http://localhost:${info.port}\n`),
);
process.on("SIGTERM", () => process.exit(0));
