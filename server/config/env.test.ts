import { expect, it } from "vitest";
import { loadEnv, startupWarnings } from "./env";

const base = { SESSION_SECRET: "a-session-secret-long-enough" };

// The production case without TRUST_PROXY is seen end to end in server/infra/supervise.test.ts.
it("warns about production over plain HTTP only when TRUST_PROXY is not 1", () => {
  const prod = (extra: Record<string, string>) =>
    startupWarnings(loadEnv({ ...base, NODE_ENV: "production", ...extra }));
  expect(prod({})).toHaveLength(1);
  expect(prod({ TRUST_PROXY: "0" })).toHaveLength(1);
  expect(prod({ TRUST_PROXY: "1" })).toEqual([]);
  expect(
    startupWarnings(loadEnv({ ...base, NODE_ENV: "development" })),
  ).toEqual([]);
});
