// The yardstick the API bench measures Sitecue against: a bare Express route answering a small
// JSON body, in its own process like the app, on the same machine in the same run.
import express from "express";
import type { AddressInfo } from "node:net";

const app = express();
app.get("/bare", (_req, res) => {
  res.json({ ok: true, at: new Date().toISOString() });
});
const server = app.listen(0, "127.0.0.1", () => {
  const { port } = server.address() as AddressInfo;
  process.stdout.write(
    JSON.stringify({ url: `http://127.0.0.1:${port}` }) + "\n",
  );
});
server.keepAliveTimeout = 30_000;
process.stdin.on("end", () => process.exit(0));
process.stdin.resume();
