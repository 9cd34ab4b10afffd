/** Bench baseline: a bare node:http server answering a JSON echo of the body (parse + re-serialise). */
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";

const server = createServer((req, res) => {
  const chunks: Buffer[] = [];
  req.on("data", (c: Buffer) => chunks.push(c));
  req.on("end", () => {
    const text = JSON.stringify(JSON.parse(Buffer.concat(chunks).toString("utf8")));
    res.writeHead(200, { "content-type": "application/json", "content-length": Buffer.byteLength(text) });
    res.end(text);
  });
});
server.listen(0, "127.0.0.1", () => process.stdout.write(`listening on http://localhost:${(server.address() as AddressInfo).port}\n`));
process.on("SIGTERM", () => process.exit(0));
