import { describe, expect, it } from "vitest";
import { clearFromWhenDone } from "./readiness";

describe("clearFromWhenDone", () => {
  it("gives the latest start the links allow once every predecessor is done", () => {
    // Carcasses done today (allows tomorrow morning); first fix done last week (allowed already).
    expect(
      clearFromWhenDone([
        { allowsFrom: "2026-12-03T08:00", done: true },
        { allowsFrom: "2026-11-27T08:00", done: true },
      ]),
    ).toBe("2026-12-03T08:00");
  });

  it("is null while any predecessor still has work left", () => {
    expect(
      clearFromWhenDone([
        { allowsFrom: "2026-12-03T08:00", done: true },
        { allowsFrom: "2026-12-04T12:00", done: false },
      ]),
    ).toBeNull();
  });

  it("is null when the task waits on nothing", () => {
    expect(clearFromWhenDone([])).toBeNull();
  });
});
