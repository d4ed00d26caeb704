// The app the API bench (api-bench.ts) loads: the demo grown to a real workshop's size — 50 more
// open jobs on the demo workshop (53 open in all), 5 on the second one sharing the plasterer, and a
// job with a 40-task programme — on its own database, listening on a loopback port. It prints one
// JSON line with its URL, then serves until its stdin ends.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { startTestApp } from "../setup/test-app";
import {
  addLongProgrammeJob,
  growDemoWorkshop,
} from "../factories/big-workshop";
import { localToday } from "../../server/modules/jobs/jobs.presenter";

const jobs = Number(process.argv[2] ?? 50);
const tasks = Number(process.argv[3] ?? 40);
const t = await startTestApp({ demo: true });
await growDemoWorkshop(t.db.ds, localToday("Europe/London"), jobs);
const longJobId = await addLongProgrammeJob(t.db.ds, tasks);
const server = http.createServer(t.sitecue.app);
// Keep-alive longer than the load generator's idle gaps, as a reverse proxy in front would.
server.keepAliveTimeout = 30_000;
await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
const { port } = server.address() as AddressInfo;

async function shutDown() {
  server.closeAllConnections();
  await new Promise<void>((r) => server.close(() => r()));
  await t.close();
  process.exit(0);
}
process.stdin.on("end", () => void shutDown());
process.stdin.resume();
process.on("SIGTERM", () => void shutDown());
process.stdout.write(
  JSON.stringify({ url: `http://127.0.0.1:${port}`, longJobId }) + "\n",
);
