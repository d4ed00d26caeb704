// `npm run bench:api` (issue 15): autocannon against Sitecue grown to a real workshop's size
// (bench-app.ts: 53 open jobs), with a bare Express route (bare-server.ts) measured in the same run
// as the yardstick. Each route gets a warm-up, then `SECONDS` seconds at `CONNECTIONS` connections,
// with the headers a browser sends (its session cookie, gzip). Prints p50/p95 latency, requests
// per second and the ratio to the bare route, then each target and whether it was met.
import { spawn, type ChildProcess } from "node:child_process";
import { createInterface } from "node:readline";
import autocannon from "autocannon";
import { signIn } from "../setup/test-app";
import { demoAccounts } from "../factories/demo-scenario";
import { statementsIn } from "../../server/db/query-tally";

const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 50);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const WARM_SECONDS = 2;
const SETTLE_MS = 3000;

/** Starts `node --import tsx <script>` and resolves with the JSON line it prints first. */
function startProcess<T>(
  script: string,
  args: string[] = [],
): Promise<{ child: ChildProcess; info: T }> {
  const child = spawn(process.execPath, ["--import", "tsx", script, ...args], {
    stdio: ["pipe", "pipe", "inherit"],
    env: process.env,
  });
  return new Promise((resolve, reject) => {
    const lines = createInterface({ input: child.stdout! });
    lines.once("line", (line) => resolve({ child, info: JSON.parse(line) }));
    child.once("exit", (code) =>
      reject(new Error(`${script} exited with ${code} before it was ready`)),
    );
  });
}

interface Measured {
  name: string;
  p50: number;
  p95: number;
  rps: number;
  statements: number | null;
  bytes: number;
}

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * p))];
}

async function measure(
  name: string,
  url: string,
  headers: Record<string, string>,
): Promise<Measured> {
  // One plain request first: its status, size and statement count, and a refusal stops the bench.
  const probe = await fetch(url, { headers });
  const body = await probe.arrayBuffer();
  if (probe.status !== 200)
    throw new Error(`${name}: ${url} answered ${probe.status}`);
  const statements = statementsIn(probe.headers.get("server-timing") ?? "");
  const run = (seconds: number, record?: number[]) =>
    new Promise<autocannon.Result>((resolve, reject) => {
      const instance = autocannon(
        { url, connections: CONNECTIONS, duration: seconds, headers },
        (err, result) => (err ? reject(err) : resolve(result)),
      );
      if (record)
        instance.on("response", (_client, _status, _bytes, ms) =>
          record.push(ms),
        );
    });
  await run(WARM_SECONDS);
  const times: number[] = [];
  const result = await run(SECONDS, times);
  // The generator stops at its time with requests still queued in the app: let them finish, so
  // the next route is measured on an idle app.
  await new Promise((r) => setTimeout(r, SETTLE_MS));
  // Refusals and errors make the figures meaningless; slowness is a figure (a timeout or no answer
  // within the run shows as an infinite p95), so the other routes are still measured.
  if (result.non2xx || result.errors)
    throw new Error(
      `${name}: ${result.non2xx} non-2xx answers, ${result.errors} errors, ${result.timeouts} timeouts`,
    );
  // A timed-out request counts at autocannon's timeout (10 s); no answer at all is infinite.
  for (let i = 0; i < result.timeouts; i++) times.push(10_000);
  if (!times.length) times.push(Infinity);
  times.sort((a, b) => a - b);
  return {
    name,
    p50: percentile(times, 0.5),
    p95: percentile(times, 0.95),
    rps: result.requests.average,
    statements,
    bytes: body.byteLength,
  };
}

const app = await startProcess<{ url: string; longJobId: string }>(
  "tests/bench/bench-app.ts",
);
const bare = await startProcess<{ url: string }>("tests/bench/bare-server.ts");
try {
  const base = app.info.url;
  const owner = await signIn(base, demoAccounts.owner.email);
  const trade = await signIn(base, demoAccounts.trade.email);
  const session = await (
    await fetch(`${base}/api/auth/session`, {
      headers: { cookie: owner.cookie },
    })
  ).json();
  const workshopId: string = session.user.memberships[0].workshopId;
  const feed = await (
    await fetch(`${base}/api/me/feed`, {
      method: "POST",
      headers: { cookie: owner.cookie, "x-csrf-token": owner.csrf },
    })
  ).json();
  const browser = { "accept-encoding": "gzip, deflate, br" };
  const as = (cookie: string) => ({ ...browser, cookie });
  const routes: [string, string, Record<string, string>][] = [
    ["bare Express route", `${bare.info.url}/bare`, browser],
    ["health", `${base}/api/health`, browser],
    [
      "owner's home: needs you now",
      `${base}/api/workshops/${workshopId}/attention`,
      as(owner.cookie),
    ],
    ["owner's home: jobs list", `${base}/api/jobs`, as(owner.cookie)],
    ["plasterer's visits", `${base}/api/me/visits`, as(trade.cookie)],
    ["owner's .ics feed", feed.url.replace(/^https?:\/\/[^/]+/, base), browser],
    [
      "programme, 40 tasks",
      `${base}/api/jobs/${app.info.longJobId}/programme`,
      as(owner.cookie),
    ],
  ];
  const results: Measured[] = [];
  // BENCH_ROUTES=<text>: only the routes whose name holds it (and the bare route), for profiling.
  const only = process.env.BENCH_ROUTES;
  for (const [name, url, headers] of routes) {
    if (only && name !== routes[0][0] && !name.includes(only)) continue;
    const m = await measure(name, url, headers);
    results.push(m);
    console.log(
      `measured ${name}: p95 ${m.p95.toFixed(1)} ms, ${m.rps.toFixed(0)} req/s`,
    );
  }
  const bareRps = results[0].rps;
  const pad = (s: string, n: number) => s.padEnd(n);
  console.log(
    `\nAPI bench: ${CONNECTIONS} connections, ${SECONDS} s per route, 53 open jobs\n`,
  );
  console.log(
    `${pad("route", 30)}${pad("p50 ms", 9)}${pad("p95 ms", 9)}${pad("req/s", 9)}${pad("of bare", 9)}${pad("SQL", 6)}bytes`,
  );
  for (const m of results)
    console.log(
      `${pad(m.name, 30)}${pad(m.p50.toFixed(1), 9)}${pad(m.p95.toFixed(1), 9)}${pad(m.rps.toFixed(0), 9)}${pad((m.rps / bareRps).toFixed(3), 9)}${pad(String(m.statements ?? "-"), 6)}${m.bytes}`,
    );
  if (!only) {
    const by = (name: string) => results.find((r) => r.name === name)!;
    const targets: [string, boolean][] = [
      ...[
        "owner's home: needs you now",
        "owner's home: jobs list",
        "plasterer's visits",
        "owner's .ics feed",
      ].map((n): [string, boolean] => [
        `${n}: p95 ${by(n).p95.toFixed(1)} ms < 150 ms`,
        by(n).p95 < 150,
      ]),
      [
        `programme, 40 tasks: ${(by("programme, 40 tasks").rps / bareRps).toFixed(3)} of bare >= 0.15`,
        by("programme, 40 tasks").rps / bareRps >= 0.15,
      ],
      [
        `health: ${(by("health").rps / bareRps).toFixed(3)} of bare >= 0.5`,
        by("health").rps / bareRps >= 0.5,
      ],
    ];
    console.log("\nTargets (issue 15):");
    for (const [text, met] of targets)
      console.log(`  ${met ? "met    " : "MISSED "} ${text}`);
  }
} finally {
  app.child.stdin!.end();
  bare.child.stdin!.end();
  await Promise.all(
    [app.child, bare.child].map(
      (c) =>
        new Promise((r) => (c.exitCode !== null ? r(null) : c.once("exit", r))),
    ),
  );
}
