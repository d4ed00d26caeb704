#!/usr/bin/env node
// Sitecue bootstrap: the whole set-up behind `npm start` and `npm test`, in plain Node with no
// dependencies, so it can run before `npm ci` has. It installs what is missing, runs a private
// MariaDB on loopback (own port, socket and data folder under .data/), then either serves the
// app (start) or runs the test suites (test), and stops everything it started on the way out.
import { spawn, spawnSync } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { freePort, signalChild, superviseApp } from "./supervise.mjs";

const root = path.resolve(
  path.dirname(fileURLToPath(import.meta.url)),
  "../..",
);
const mode = process.argv[2];
const extraArgs = process.argv.slice(3);
if (mode !== "start" && mode !== "test" && mode !== "bench") {
  console.error("Usage: node server/infra/bootstrap.mjs start|test|bench");
  process.exit(2);
}
const production = process.env.NODE_ENV === "production";
const children = new Set();
let stopping = false;

function say(msg) {
  console.log(`[sitecue] ${msg}`);
}

function fail(msg) {
  console.error(`[sitecue] ${msg}`);
  process.exitCode = 1;
}

function has(cmd) {
  return (
    spawnSync("sh", ["-c", `command -v ${cmd}`], { stdio: "ignore" }).status ===
    0
  );
}

function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { stdio: "inherit", cwd: root, ...opts });
  if (r.status !== 0)
    throw new Error(
      `${cmd} ${args.join(" ")} exited with ${r.status ?? r.signal}`,
    );
}

/** npm ci when node_modules is missing or was installed from another package-lock.json. */
function ensureNodeModules() {
  const lock = path.join(root, "package-lock.json");
  const stamp = path.join(root, "node_modules", ".sitecue-lock-hash");
  const hash = createHash("sha256").update(fs.readFileSync(lock)).digest("hex");
  const current = fs.existsSync(stamp)
    ? fs.readFileSync(stamp, "utf8").trim()
    : null;
  if (
    current === hash &&
    fs.existsSync(path.join(root, "node_modules", ".bin", "vitest"))
  )
    return;
  say(
    current
      ? "package-lock.json changed: running npm ci"
      : "Installing packages (npm ci)",
  );
  run("npm", ["ci", "--no-audit", "--no-fund"]);
  fs.writeFileSync(stamp, hash + "\n");
}

/** Installs a Debian package when its program is missing (as root), or says how to. */
function ensureDebian(pkg, program) {
  if (has(program)) return;
  const cmd = `apt-get update && apt-get install -y ${pkg}`;
  if (process.getuid?.() !== 0) {
    throw new Error(
      `${program} is missing. Install it with:\n  sudo sh -c '${cmd}'`,
    );
  }
  say(`${program} is missing: installing Debian's ${pkg}`);
  run("sh", ["-c", `DEBIAN_FRONTEND=noninteractive ${cmd}`], {
    stdio: ["ignore", "inherit", "inherit"],
  });
}

function logTail(file) {
  try {
    return fs
      .readFileSync(file, "utf8")
      .trim()
      .split("\n")
      .slice(-8)
      .join("\n");
  } catch {
    return "(no log)";
  }
}

function sql(dir, statements) {
  const r = spawnSync(
    "mariadb",
    [
      "--no-defaults",
      `--socket=${path.join(dir, "mysqld.sock")}`,
      "-uroot",
      "-e",
      statements,
    ],
    { encoding: "utf8" },
  );
  if (r.status !== 0)
    throw new Error(`MariaDB refused set-up SQL: ${r.stderr.trim()}`);
}

/** Starts a private mariadbd on 127.0.0.1 with its data under `dir`; resolves when it answers. */
async function startMariaDB(dir, port) {
  const dataDir = path.join(dir, "db");
  fs.mkdirSync(dir, { recursive: true });
  if (!fs.existsSync(path.join(dataDir, "mysql"))) {
    say(
      `Initialising a MariaDB data folder in ${path.relative(root, dataDir)}`,
    );
    fs.mkdirSync(dataDir, { recursive: true });
    run(
      "mariadb-install-db",
      [
        "--no-defaults",
        "--user=root",
        "--auth-root-authentication-method=normal",
        "--skip-test-db",
        `--datadir=${dataDir}`,
      ],
      { stdio: ["ignore", "ignore", "inherit"] },
    );
  }
  const socket = path.join(dir, "mysqld.sock");
  const pidFile = path.join(dir, "mysqld.pid");
  if (fs.existsSync(pidFile)) {
    const pid = Number(fs.readFileSync(pidFile, "utf8"));
    let alive = false;
    try {
      process.kill(pid, 0);
      alive = true;
    } catch {
      /* stale pid file */
    }
    if (alive)
      throw new Error(
        `A MariaDB for ${path.relative(root, dir)} is already running (pid ${pid}). Is another Sitecue running? Stop it first.`,
      );
    fs.rmSync(pidFile, { force: true });
  }
  fs.rmSync(socket, { force: true });
  say(`Starting MariaDB on 127.0.0.1:${port}`);
  const child = spawn(
    "mariadbd",
    [
      "--no-defaults",
      "--user=root",
      `--datadir=${dataDir}`,
      `--port=${port}`,
      "--bind-address=127.0.0.1",
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      `--log-error=${path.join(dir, "mariadb.log")}`,
      "--skip-name-resolve",
      "--character-set-server=utf8mb4",
      "--collation-server=utf8mb4_unicode_ci",
      "--innodb-buffer-pool-size=128M",
      "--innodb-flush-log-at-trx-commit=2",
      "--max-connections=500",
    ],
    { stdio: "ignore", detached: true },
  );
  children.add(child);
  child.on("exit", () => children.delete(child));
  const deadline = Date.now() + 30000;
  for (;;) {
    const r = spawnSync(
      "mariadb-admin",
      ["--no-defaults", `--socket=${socket}`, "-uroot", "ping"],
      { stdio: "ignore" },
    );
    if (r.status === 0) break;
    if (child.exitCode !== null)
      throw new Error(
        `MariaDB stopped at start-up. The end of its log:\n${logTail(path.join(dir, "mariadb.log"))}`,
      );
    if (Date.now() > deadline)
      throw new Error(
        `MariaDB did not answer within 30 s; see ${path.join(dir, "mariadb.log")}`,
      );
    await new Promise((r) => setTimeout(r, 100));
  }
  return child;
}

function credentials(dir) {
  const file = path.join(dir, "credentials.json");
  if (fs.existsSync(file)) return JSON.parse(fs.readFileSync(file, "utf8"));
  const c = {
    appPassword: randomBytes(18).toString("base64url"),
    sessionSecret: randomBytes(32).toString("base64url"),
  };
  fs.writeFileSync(file, JSON.stringify(c, null, 2), { mode: 0o600 });
  return c;
}

async function stopChild(child, name, signal = "SIGTERM", ms = 15000) {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const done = new Promise((r) => child.once("exit", r));
  signalChild(child, signal);
  const timer = setTimeout(() => {
    say(`${name} did not stop in time; killing it`);
    signalChild(child, "SIGKILL");
  }, ms);
  await done;
  clearTimeout(timer);
}

let mariadb = null;
/** The vitest run (test mode). */
let app = null;
/** The app under its supervisor (start mode): restarted when it dies, stopped with everything. */
let appSupervisor = null;
let testDir = null;

/** Removes test data folders left by runs whose bootstrap is no longer alive. */
function removeStaleTestRuns() {
  const base = path.join(root, ".data", "test");
  if (!fs.existsSync(base)) return;
  for (const name of fs.readdirSync(base)) {
    const pid = Number(/^run-(\d+)$/.exec(name)?.[1]);
    let alive = false;
    try {
      if (pid) {
        process.kill(pid, 0);
        alive = true;
      }
    } catch {
      // that run is gone
    }
    if (!alive)
      fs.rmSync(path.join(base, name), { recursive: true, force: true });
  }
}
async function stopAll() {
  if (stopping) return;
  stopping = true;
  if (appSupervisor) {
    say("Stopping the app");
    await appSupervisor.stop();
  }
  if (app) {
    say("Stopping the app");
    await stopChild(app, "The app");
  }
  if (mariadb) {
    say("Stopping MariaDB");
    await stopChild(mariadb, "MariaDB", "SIGTERM", 30000);
  }
  if (testDir) fs.rmSync(testDir, { recursive: true, force: true });
}

for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"]) {
  process.on(sig, () => {
    stopAll().then(() => process.exit(process.exitCode ?? 0));
  });
}

async function main() {
  const t0 = Date.now();
  ensureNodeModules();
  ensureDebian("mariadb-server", "mariadbd");
  if (mode === "test") ensureDebian("chromium", "chromium");

  // Tests get a fresh data folder per run (so two runs in one checkout never meet), removed at the end.
  const dir =
    mode === "start"
      ? path.join(root, ".data", production ? "prod" : "dev")
      : path.join(root, ".data", "test", `run-${process.pid}`);
  if (mode !== "start") {
    removeStaleTestRuns();
    testDir = dir;
  }
  // Another program may take a free port between the check and MariaDB's bind: then try the next.
  let dbPort = await freePort(
    Number(process.env.SITECUE_DB_PORT ?? (mode === "start" ? 3406 : 3456)),
  );
  for (let attempt = 1; ; attempt++) {
    try {
      mariadb = await startMariaDB(dir, dbPort);
      break;
    } catch (err) {
      if (attempt >= 5 || !/Address already in use/.test(err.message))
        throw err;
      say(`Port ${dbPort} was taken meanwhile; trying another`);
      dbPort = await freePort(dbPort + 1);
    }
  }
  const creds = credentials(dir);
  const esc = (s) => s.replace(/'/g, "''");
  const env = {
    ...process.env,
    DB_HOST: "127.0.0.1",
    DB_PORT: String(dbPort),
    // The S3 SDK is pinned to a release that supports Node 20; its notice about later releases
    // needing Node 22 says nothing about this one, so it is switched off.
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
  };

  if (mode === "start") {
    sql(
      dir,
      [
        "CREATE DATABASE IF NOT EXISTS sitecue CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;",
        `CREATE USER IF NOT EXISTS 'sitecue'@'127.0.0.1' IDENTIFIED BY '${esc(creds.appPassword)}';`,
        `ALTER USER 'sitecue'@'127.0.0.1' IDENTIFIED BY '${esc(creds.appPassword)}';`,
        "GRANT ALL PRIVILEGES ON sitecue.* TO 'sitecue'@'127.0.0.1';",
      ].join(" "),
    );
    if (
      production &&
      !fs.existsSync(path.join(root, "dist", "client", "index.html"))
    ) {
      say("Building the client (vite build)");
      run("npx", ["vite", "build", "--logLevel", "warn"]);
    }
    Object.assign(env, {
      NODE_ENV: production ? "production" : "development",
      DB_NAME: "sitecue",
      DB_USER: "sitecue",
      DB_PASSWORD: creds.appPassword,
      SESSION_SECRET: process.env.SESSION_SECRET ?? creds.sessionSecret,
      SITECUE_MAIL_DIR: path.join(dir, "mail"),
      SITECUE_BOOT_STARTED: String(t0),
    });
    if (!production) {
      env.SMTP_FAKE ??= "1";
      env.S3_FAKE ??= "1";
      env.SITECUE_S3_DIR ??= path.join(dir, "s3");
    }
    // The supervisor checks the port before each start and passes it as PORT; main.ts makes
    // APP_URL http://localhost:PORT unless it was set, so links and "ready at" carry the real port.
    // A crash restarts the app with back-off; MariaDB keeps running. Ctrl-C stops both (stopAll).
    appSupervisor = superviseApp({
      root,
      preferredPort: Number(process.env.PORT ?? 3000),
      // "(N s after npm start)" belongs to the first start only.
      env: () => {
        const e = { ...env };
        delete env.SITECUE_BOOT_STARTED;
        return e;
      },
      log: say,
    });
    // Runs until a signal: stopAll stops the app and MariaDB, then exits.
    return new Promise(() => {});
  }

  // Test mode: an admin user that may create one database per test file (sitecue_t_*).
  const adminPassword = randomBytes(18).toString("base64url");
  sql(
    dir,
    [
      `CREATE USER IF NOT EXISTS 'sitecue_test'@'127.0.0.1' IDENTIFIED BY '${esc(adminPassword)}';`,
      `ALTER USER 'sitecue_test'@'127.0.0.1' IDENTIFIED BY '${esc(adminPassword)}';`,
      "GRANT ALL PRIVILEGES ON `sitecue\\_t\\_%`.* TO 'sitecue_test'@'127.0.0.1';",
    ].join(" "),
  );
  if (mode === "bench") {
    // The API bench (npm run bench:api): its own grown database on this MariaDB, no client.
    Object.assign(env, {
      NODE_ENV: "test",
      DB_ADMIN_USER: "sitecue_test",
      DB_ADMIN_PASSWORD: adminPassword,
      SESSION_SECRET: randomBytes(32).toString("base64url"),
    });
    const bench = spawn(
      process.execPath,
      ["--import", "tsx", "tests/bench/api-bench.ts", ...extraArgs],
      { cwd: root, env, stdio: "inherit", detached: true },
    );
    app = bench;
    process.exitCode = await new Promise((r) =>
      bench.once("exit", (c, s) => r(c ?? (s ? 1 : 0))),
    );
    app = null;
    await stopAll();
    return;
  }
  // Each run builds into its own folder, so a run never serves another run's half-built client.
  const clientDir = path.join(dir, "client");
  say("Building the client for the browser tests (vite build)");
  run("npx", [
    "vite",
    "build",
    "--logLevel",
    "warn",
    "--outDir",
    clientDir,
    "--emptyOutDir",
  ]);
  Object.assign(env, {
    SITECUE_CLIENT_DIR: clientDir,
    NODE_ENV: "test",
    DB_ADMIN_USER: "sitecue_test",
    DB_ADMIN_PASSWORD: adminPassword,
    SESSION_SECRET: randomBytes(32).toString("base64url"),
  });
  say(
    `Set-up took ${((Date.now() - t0) / 1000).toFixed(1)} s; running the tests`,
  );
  // Without arguments: unit and API tests first, then the browser tests on their own, so the
  // browser never competes with a dozen API test files for this machine's two cores.
  const phases = extraArgs.length
    ? [extraArgs]
    : [
        ["--project", "shared", "--project", "server"],
        ["--project", "e2e"],
      ];
  let code = 0;
  for (const args of phases) {
    const vitest = spawn("npx", ["vitest", "run", ...args], {
      cwd: root,
      env,
      stdio: "inherit",
      detached: true,
    });
    app = vitest;
    const phaseCode = await new Promise((r) =>
      vitest.once("exit", (c, s) => r(c ?? (s ? 1 : 0))),
    );
    app = null;
    if (phaseCode !== 0) code = phaseCode;
    if (stopping) break;
  }
  say(
    `Tests finished in ${((Date.now() - t0) / 1000).toFixed(1)} s with exit code ${code}`,
  );
  process.exitCode = code;
  await stopAll();
}

main().catch(async (err) => {
  fail(err.message);
  await stopAll();
  process.exit(1);
});
