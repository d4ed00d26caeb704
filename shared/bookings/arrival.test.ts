import { describe, expect, it } from "vitest";
import { arrivalForSlot, type Arrival } from "./arrival";

const afternoon: Arrival = {
  arrivalWindow: "afternoon",
  arrivalFrom: null,
  arrivalTo: null,
};
const range: Arrival = {
  arrivalWindow: "range",
  arrivalFrom: "08:00",
  arrivalTo: "09:00",
};

describe("the arrival follows the booked slot (issue 16)", () => {
  it("turns an afternoon arrival into the morning when the slot moves to a morning", () => {
    // The case: Fri 12:00–16:30 "afternoon" moved to Tue 08:00–12:00.
    expect(arrivalForSlot("2026-12-08T08:00", afternoon)).toEqual({
      arrivalWindow: "morning",
      arrivalFrom: null,
      arrivalTo: null,
    });
  });

  it("makes any arrival the afternoon when the slot starts at midday", () => {
    expect(arrivalForSlot("2026-12-08T12:00", range)).toEqual(afternoon);
    expect(
      arrivalForSlot("2026-12-08T12:00", {
        arrivalWindow: "all-day",
        arrivalFrom: null,
        arrivalTo: null,
      }).arrivalWindow,
    ).toBe("afternoon");
  });

  it("keeps a morning, all-day or morning arrival time on a slot from the morning", () => {
    expect(arrivalForSlot("2026-12-08T08:00", range)).toEqual(range);
    expect(
      arrivalForSlot("2026-12-08T08:00", {
        arrivalWindow: "all-day",
        arrivalFrom: null,
        arrivalTo: null,
      }).arrivalWindow,
    ).toBe("all-day");
    // An arrival time before the slot opens cannot stand: the morning instead.
    expect(arrivalForSlot("2026-12-08T09:30", range).arrivalWindow).toBe(
      "morning",
    );
  });
});
