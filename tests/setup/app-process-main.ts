// Run as its own process by tests/setup/app-process.ts: a test app (demo data, its own database
// and S3 fake) listening on a loopback port, so a test can see whether a request takes the
// process down. Nothing here catches uncaught errors: an unhandled 'error' event exits the
// process, as it would in production.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { startTestApp } from "./test-app";

const uploadMaxBytes = process.argv[2] ? Number(process.argv[2]) : undefined;
const t = await startTestApp({ demo: true, uploadMaxBytes });
const server = http.createServer(t.sitecue.app);
await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
const { port } = server.address() as AddressInfo;

let closing = false;
async function shutDown() {
  if (closing) return;
  closing = true;
  server.closeAllConnections();
  await new Promise<void>((r) => server.close(() => r()));
  await t.close();
  process.exit(0);
}
// The parent ends stdin (or sends SIGTERM) when it is done; stdin also ends if the parent dies.
process.stdin.on("end", () => void shutDown());
process.stdin.resume();
process.on("SIGTERM", () => void shutDown());

process.stdout.write(
  JSON.stringify({
    url: `http://127.0.0.1:${port}`,
    db: t.db.settings,
    s3: { endpoint: t.s3.endpoint, bucket: t.s3.bucket },
  }) + "\n",
);
