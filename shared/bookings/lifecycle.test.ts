import { describe, expect, it } from "vitest";
import { bookingStates } from "../schemas/common";
import {
  actionAllowed,
  bookingActions,
  bookingStateTraits,
  statesWhere,
  tradeSeesAddress,
} from "./lifecycle";

describe("booking state traits", () => {
  it("maps each state to a STATUS and PARTSTAT value RFC 5545 allows for an event", () => {
    // RFC 5545 §3.8.1.11 (STATUS for VEVENT) and §3.2.12 (PARTSTAT for VEVENT).
    const statuses = new Set(["TENTATIVE", "CONFIRMED", "CANCELLED"]);
    const partstats = new Set([
      "NEEDS-ACTION",
      "ACCEPTED",
      "DECLINED",
      "TENTATIVE",
      "DELEGATED",
    ]);
    for (const s of bookingStates) {
      const t = bookingStateTraits[s];
      if (t.status !== null) expect(statuses.has(t.status), s).toBe(true);
      if (t.partstat !== null) expect(partstats.has(t.partstat), s).toBe(true);
    }
  });

  it("calls a visit confirmed only once the trade has confirmed it, everywhere", () => {
    for (const s of bookingStates) {
      const t = bookingStateTraits[s];
      const confirmed = s === "confirmed";
      expect(t.status === "CONFIRMED", `${s} STATUS`).toBe(confirmed);
      expect(t.partstat === "ACCEPTED", `${s} PARTSTAT`).toBe(confirmed);
      expect(t.customerSees === "confirmed", `${s} customer`).toBe(confirmed);
      expect(t.address === "always", `${s} address`).toBe(confirmed);
    }
  });

  it("keeps the traits inside each other: answerable is asked, chaseable is answerable, holding dates stands", () => {
    for (const s of bookingStates) {
      const t = bookingStateTraits[s];
      if (t.answerable) expect(t.asked, s).toBe(true);
      if (t.chaseable) expect(t.answerable, s).toBe(true);
      if (t.holdsDates) expect(t.standing && t.asked, s).toBe(true);
      // Nobody but the workshop hears of a booking the trade was never asked about.
      if (!t.asked) expect(t.customerSees, s).toBe("nothing");
    }
    expect(statesWhere("holdsDates")).toEqual([
      "sent",
      "confirmed",
      "date-proposed",
      "needs-reconfirming",
    ]);
    expect(statesWhere("chaseable")).toEqual(["sent", "needs-reconfirming"]);
  });

  it("shows the full address once confirmed, before that only when the workshop shares it", () => {
    expect(tradeSeesAddress({ state: "confirmed", shareAddress: false })).toBe(
      true,
    );
    expect(tradeSeesAddress({ state: "sent", shareAddress: false })).toBe(
      false,
    );
    expect(tradeSeesAddress({ state: "sent", shareAddress: true })).toBe(true);
    // Declined or cancelled: the trade is off the job, shared or not.
    expect(tradeSeesAddress({ state: "declined", shareAddress: true })).toBe(
      false,
    );
    expect(tradeSeesAddress({ state: "draft", shareAddress: true })).toBe(
      false,
    );
  });
});

describe("booking actions", () => {
  it("start only from states and lead only to states", () => {
    for (const [name, a] of Object.entries(bookingActions)) {
      expect(a.from.length, name).toBeGreaterThan(0);
      for (const s of a.from) expect(bookingStates, name).toContain(s);
      if (a.to !== "same") expect(bookingStates, name).toContain(a.to);
    }
  });

  it("let a trade answer only what is still answerable, and chase only what is unanswered", () => {
    for (const s of bookingStates) {
      expect(actionAllowed("confirm", s), s).toBe(
        bookingStateTraits[s].answerable,
      );
      expect(actionAllowed("chase", s), s).toBe(
        bookingStateTraits[s].chaseable,
      );
    }
    expect(actionAllowed("send", "draft")).toBe(true);
    expect(actionAllowed("send", "sent")).toBe(false);
    expect(actionAllowed("cancel", "cancelled")).toBe(false);
    expect(actionAllowed("cancel", "declined")).toBe(false);
  });

  it("raise SEQUENCE whenever the dates change (RFC 5546 §2.1.4)", () => {
    expect(bookingActions.reschedule.sequenceUp).toBe("always");
    expect(bookingActions.acceptProposal.sequenceUp).toBe("always");
    expect(bookingActions.extend.sequenceUp).toBe("always");
    // A bare answer changes the trade's participation, not the event.
    expect(bookingActions.confirm.sequenceUp).toBe("never");
  });
});
