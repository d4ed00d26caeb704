// Keeps the app process running: plain Node ESM with no dependencies, because the bootstrap
// (`npm start`) uses it before `npm ci` may have run. A crash costs a restart with back-off, never
// the database (issue 13: one bad request used to stop MariaDB too, until someone typed npm start).
import { spawn } from "node:child_process";
import net from "node:net";

/**
 * The app's exit code when its port was taken between the free-port check and its listen
 * (EX_TEMPFAIL in BSD sysexits.h: "retry later"); the supervisor then moves to another port.
 */
export const PORT_TAKEN_EXIT_CODE = 75;

/** Whether 127.0.0.1:port can be bound right now. */
export function portFree(port) {
  return new Promise((resolve) => {
    const s = net.createServer();
    s.once("error", () => resolve(false));
    s.listen(port, "127.0.0.1", () => s.close(() => resolve(true)));
  });
}

/** The first port from `preferred` on that can be bound on 127.0.0.1 (50 tried). */
export async function freePort(preferred) {
  for (let p = preferred; p < preferred + 50; p++)
    if (await portFree(p)) return p;
  throw new Error(`No free port near ${preferred}`);
}

/** "exit code 1" or "killed by SIGKILL", for log lines. */
export function describeExit(code, signal) {
  return signal ? `killed by ${signal}` : `exit code ${code}`;
}

/** 1 s, 2 s, 4 s … doubling per restart in a row, capped at `maxMs`. */
export function backoffMs(restartsInARow, firstMs = 1000, maxMs = 30000) {
  return Math.min(firstMs * 2 ** restartsInARow, maxMs);
}

/** Sends `signal` to the child's process group (it is started detached), or to the child alone. */
export function signalChild(child, signal) {
  try {
    process.kill(-child.pid, signal);
  } catch {
    try {
      child.kill(signal);
    } catch {
      /* already gone */
    }
  }
}

/**
 * Runs the app (`node --import tsx server/main.ts` in `root`) and starts it again whenever it stops
 * without being asked to: after `backoffMs` (1 s, 2 s, 4 s … capped at `maxDelayMs`; the count
 * resets once a run has lasted `steadyMs`), with the line "The app stopped (exit code N); starting
 * it again in 2 s". Before every start the port is checked again (the next free one from
 * `preferredPort`), and an exit with PORT_TAKEN_EXIT_CODE moves straight on to the next free port,
 * so APP_URL and the "ready at" line always carry the port the app really listens on.
 * `env(port)` gives the child's environment for a start on `port`; `execArgv` adds Node options
 * (e.g. `--inspect`). `stop()` ends it for good.
 */
export function superviseApp(opts) {
  const {
    root,
    env,
    preferredPort,
    log = (msg) => console.log(`[sitecue] ${msg}`),
    stdio = "inherit",
    onSpawn = () => {},
    execArgv = [],
    firstDelayMs = 1000,
    maxDelayMs = 30000,
    steadyMs = 60000,
  } = opts;
  let child = null;
  let stopping = false;
  let restartsInARow = 0;
  let port = preferredPort;
  let timer = null;
  let wake = null;
  let resolveDone;
  const done = new Promise((r) => (resolveDone = r));

  async function startOnce() {
    if (!(await portFree(port))) port = await freePort(port + 1);
    const childEnv = await env(port);
    if (stopping) return null;
    const c = spawn(
      process.execPath,
      ["--import", "tsx", ...execArgv, "server/main.ts"],
      {
        cwd: root,
        env: { ...childEnv, PORT: String(port) },
        stdio,
        // Its own process group: Ctrl-C reaches the bootstrap, which stops the app in order.
        detached: true,
      },
    );
    child = c;
    onSpawn(c);
    return c;
  }

  async function loop() {
    while (!stopping) {
      const c = await startOnce();
      if (!c) break;
      const began = Date.now();
      const { code, signal } = await new Promise((resolve) => {
        c.once("error", (err) => {
          log(`The app could not be started: ${err.message}`);
          resolve({ code: 1, signal: null });
        });
        c.once("exit", (code, signal) => resolve({ code, signal }));
      });
      child = null;
      if (stopping) break;
      if (code === PORT_TAKEN_EXIT_CODE) {
        // Another program took the port after the check: the next free one, at once.
        log(
          `Port ${port} was taken before the app could listen; trying another`,
        );
        port = await freePort(port + 1);
        continue;
      }
      if (Date.now() - began >= steadyMs) restartsInARow = 0;
      const delay = backoffMs(restartsInARow, firstDelayMs, maxDelayMs);
      restartsInARow++;
      log(
        `The app stopped (${describeExit(code, signal)}); starting it again in ${formatSeconds(delay)}`,
      );
      await new Promise((resolve) => {
        timer = setTimeout(resolve, delay);
        wake = resolve;
      });
      timer = null;
      wake = null;
    }
    resolveDone();
  }

  void loop();

  return {
    /** The running app process, or null between starts. */
    get child() {
      return child;
    },
    /** The port of the current (or next) start. */
    get port() {
      return port;
    },
    /** Stops the app (SIGTERM, SIGKILL after `ms`) and never starts it again. */
    async stop(ms = 15000) {
      stopping = true;
      if (timer) clearTimeout(timer);
      wake?.();
      const c = child;
      if (c && c.exitCode === null && c.signalCode === null) {
        const exited = new Promise((r) => c.once("exit", r));
        signalChild(c, "SIGTERM");
        const kill = setTimeout(() => {
          log("The app did not stop in time; killing it");
          signalChild(c, "SIGKILL");
        }, ms);
        await exited;
        clearTimeout(kill);
      }
      await done;
    },
  };
}

function formatSeconds(ms) {
  const s = ms / 1000;
  return `${Number.isInteger(s) ? s : s.toFixed(1)} s`;
}
