import { Initial1764633600000 } from "./1764633600000-initial";
import { ProgrammeStarters1764720000000 } from "./1764720000000-programme-starters";

/** Migration classes in order (classes, not a glob, so vitest and tsx load them alike). */
export const migrations = [
  Initial1764633600000,
  ProgrammeStarters1764720000000,
];
