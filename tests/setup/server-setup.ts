import { afterEach, beforeEach, vi } from "vitest";

// epic-stack's habit: an unexpected console.error fails the test that caused it, so a swallowed
// 500 or a React warning cannot pass unnoticed. Tests that expect one can mock console.error.
let errors: unknown[][] = [];
beforeEach(() => {
  errors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});
afterEach(() => {
  vi.restoreAllMocks();
  if (errors.length)
    throw new Error(
      `console.error was called:\n${errors.map((e) => e.map(String).join(" ")).join("\n")}`,
    );
});
