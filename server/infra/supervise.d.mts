// Types for supervise.mjs (plain JavaScript so the bootstrap can run it before npm ci).
import type { ChildProcess, StdioOptions } from "node:child_process";

export declare const PORT_TAKEN_EXIT_CODE: number;
export declare function portFree(port: number): Promise<boolean>;
export declare function freePort(preferred: number): Promise<number>;
export declare function describeExit(
  code: number | null,
  signal: NodeJS.Signals | null,
): string;
export declare function backoffMs(
  restartsInARow: number,
  firstMs?: number,
  maxMs?: number,
): number;

export interface SuperviseAppOptions {
  root: string;
  env: (port: number) => NodeJS.ProcessEnv | Promise<NodeJS.ProcessEnv>;
  preferredPort: number;
  log?: (message: string) => void;
  stdio?: StdioOptions;
  onSpawn?: (child: ChildProcess) => void;
  execArgv?: string[];
  firstDelayMs?: number;
  maxDelayMs?: number;
  steadyMs?: number;
}

export interface AppSupervisor {
  readonly child: ChildProcess | null;
  readonly port: number;
  stop(ms?: number): Promise<void>;
}

export declare function superviseApp(opts: SuperviseAppOptions): AppSupervisor;
