// The app the API bench (api-bench.ts) loads: the demo grown to a real workshop's size — 50 more
// open jobs on the demo workshop (53 open in all), 5 on the second one sharing the plasterer, and a
// job with a 40-task programme — on its own database, listening on a loopback port. It prints one
// JSON line with its URL, then serves until its stdin ends.
import fs from "node:fs";
import http from "node:http";
import inspector from "node:inspector";
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

// BENCH_PROFILE=<file>: a V8 CPU profile of the app while it serves, written when it stops.
const profiler = process.env.BENCH_PROFILE ? new inspector.Session() : null;
if (profiler) {
  profiler.connect();
  await post(profiler, "Profiler.enable");
  await post(profiler, "Profiler.start");
}
function post(s: inspector.Session, method: string): Promise<unknown> {
  return new Promise((resolve, reject) =>
    s.post(method, (err, result) => (err ? reject(err) : resolve(result))),
  );
}

// The load generator stops at its time limit with requests still being answered: shutting down
// waits for them, so none meets a closed database.
let inFlight = 0;
server.on("request", (_req, res) => {
  inFlight += 1;
  res.once("close", () => (inFlight -= 1));
});

async function shutDown() {
  for (let waited = 0; inFlight > 0 && waited < 60_000; waited += 100)
    await new Promise((r) => setTimeout(r, 100));
  if (profiler) {
    const { profile } = (await post(profiler, "Profiler.stop")) as {
      profile: unknown;
    };
    fs.writeFileSync(process.env.BENCH_PROFILE!, JSON.stringify(profile));
  }
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
