// A booking's lifecycle in one place (issue 16): what each state means for everyone who looks at
// it, and which action leads from which states to which. Server rules (job access, the engine's
// pins, the trade's busy days, who may answer or be chased, the address, the calendar parts) and
// the screens ask these tables instead of writing the states out again.
import type { BookingState } from "../schemas/common";
import { bookingStates } from "../schemas/common";

/** What the customer is told about a visit in this state. */
export type CustomerSees = "nothing" | "to-be-confirmed" | "confirmed";

/** When the trade sees the site's full address (otherwise only its area). */
export type AddressRule = "always" | "when-shared" | "never";

export interface BookingStateTraits {
  /** The trade has been asked (sent, or answered since): it is their visit to see. */
  asked: boolean;
  /** Holds its dates: the engine pins the task there, the trade counts as busy on those days, and the trade is on the job. */
  holdsDates: boolean;
  /** A booking stands for the task (a draft too): no new one is needed beside it. */
  standing: boolean;
  /** The trade may still confirm, decline or propose another date. */
  answerable: boolean;
  /** Asked and not answered: the workshop may chase it. */
  chaseable: boolean;
  /** Drawn on the workshop's calendars. */
  onCalendar: boolean;
  customerSees: CustomerSees;
  address: AddressRule;
  /**
   * The trade's participation as an iCalendar PARTSTAT (RFC 5545 §3.2.12), for the events that
   * carry an attendee; null where no invitation stands.
   */
  partstat: "NEEDS-ACTION" | "ACCEPTED" | "DECLINED" | "TENTATIVE" | null;
  /**
   * The event's STATUS (RFC 5545 §3.8.1.11: TENTATIVE, CONFIRMED or CANCELLED): confirmed only
   * once the trade has confirmed; null where the state is in no trade's or customer's calendar.
   */
  status: "TENTATIVE" | "CONFIRMED" | "CANCELLED" | null;
}

export const bookingStateTraits: Record<BookingState, BookingStateTraits> = {
  draft: {
    asked: false,
    holdsDates: false,
    standing: true,
    answerable: false,
    chaseable: false,
    onCalendar: true,
    customerSees: "nothing",
    address: "never",
    partstat: null,
    status: null,
  },
  sent: {
    asked: true,
    holdsDates: true,
    standing: true,
    answerable: true,
    chaseable: true,
    onCalendar: true,
    customerSees: "to-be-confirmed",
    address: "when-shared",
    partstat: "NEEDS-ACTION",
    status: "TENTATIVE",
  },
  confirmed: {
    asked: true,
    holdsDates: true,
    standing: true,
    answerable: true,
    chaseable: false,
    onCalendar: true,
    customerSees: "confirmed",
    address: "always",
    partstat: "ACCEPTED",
    status: "CONFIRMED",
  },
  declined: {
    asked: true,
    holdsDates: false,
    standing: false,
    answerable: false,
    chaseable: false,
    onCalendar: false,
    customerSees: "nothing",
    address: "never",
    partstat: "DECLINED",
    status: null,
  },
  "date-proposed": {
    asked: true,
    holdsDates: true,
    standing: true,
    answerable: true,
    chaseable: false,
    onCalendar: true,
    customerSees: "to-be-confirmed",
    address: "when-shared",
    partstat: "TENTATIVE",
    status: "TENTATIVE",
  },
  "needs-reconfirming": {
    asked: true,
    holdsDates: true,
    standing: true,
    answerable: true,
    chaseable: true,
    onCalendar: true,
    customerSees: "to-be-confirmed",
    address: "when-shared",
    partstat: "NEEDS-ACTION",
    status: "TENTATIVE",
  },
  cancelled: {
    asked: false,
    holdsDates: false,
    standing: false,
    answerable: false,
    chaseable: false,
    onCalendar: false,
    customerSees: "nothing",
    address: "never",
    partstat: null,
    status: "CANCELLED",
  },
};

type Flag = {
  [K in keyof BookingStateTraits]: BookingStateTraits[K] extends boolean
    ? K
    : never;
}[keyof BookingStateTraits];

/** The states with `trait`, in the order of `bookingStates` (for `In(…)` queries and filters). */
export function statesWhere(trait: Flag): BookingState[] {
  return bookingStates.filter((s) => bookingStateTraits[s][trait]);
}

/** Whether a booking in `state` has `trait`. */
export const stateIs = (state: BookingState, trait: Flag): boolean =>
  bookingStateTraits[state][trait];

/** Whether the trade sees the full site address of a booking (the one address rule). */
export function tradeSeesAddress(b: {
  state: BookingState;
  shareAddress: boolean;
}): boolean {
  const rule = bookingStateTraits[b.state].address;
  return rule === "always" || (rule === "when-shared" && b.shareAddress);
}

/** Who a thread note about an action goes to (the thread's audiences). */
export type NoteAudience = "workshop" | "trades" | "job";

/** The e-mails a trade gets about a booking (the reminder is sent by time, not by an action). */
export type BookingMailKind =
  | "invitation"
  | "updated"
  | "chase"
  | "cancel"
  | "reminder"
  | "proposal-rejected";

export interface BookingAction {
  /** The states the action may start from. */
  from: readonly BookingState[];
  /** The state it leads to; "same" keeps the state. */
  to: BookingState | "same";
  /** RFC 5546 §2.1.4: SEQUENCE goes up when the dates, times or status of the event change. */
  sequenceUp: "always" | "when-dates-change" | "when-asked" | "never";
  /** The thread note's audience; null: no note. */
  note: NoteAudience | "trades-when-asked" | null;
  /** The e-mail it sends the trade; null: none. */
  mail: Exclude<BookingMailKind, "reminder"> | null;
}

const answerableStates = statesWhere("answerable");

/** Every action on a booking, with where it may start and where it leads. */
export const bookingActions = {
  send: {
    from: ["draft"],
    to: "sent",
    sequenceUp: "never",
    note: "workshop",
    mail: "invitation",
  },
  editDraft: {
    from: ["draft"],
    to: "same",
    sequenceUp: "never",
    note: null,
    mail: null,
  },
  // The confirmed invitation goes back with the full address (same UID and SEQUENCE).
  confirm: {
    from: answerableStates,
    to: "confirmed",
    sequenceUp: "never",
    note: "trades",
    mail: "updated",
  },
  decline: {
    from: answerableStates,
    to: "declined",
    sequenceUp: "never",
    note: "workshop",
    mail: null,
  },
  propose: {
    from: answerableStates,
    to: "date-proposed",
    sequenceUp: "never",
    note: "workshop",
    mail: null,
  },
  acceptProposal: {
    from: ["date-proposed"],
    to: "confirmed",
    sequenceUp: "always",
    note: "trades",
    mail: "updated",
  },
  rejectProposal: {
    from: ["date-proposed"],
    to: "sent",
    sequenceUp: "never",
    note: "workshop",
    mail: "proposal-rejected",
  },
  reschedule: {
    from: statesWhere("holdsDates"),
    to: "needs-reconfirming",
    sequenceUp: "always",
    note: "trades",
    mail: "updated",
  },
  cancel: {
    from: statesWhere("standing"),
    to: "cancelled",
    sequenceUp: "when-asked",
    note: "trades-when-asked",
    mail: "cancel",
  },
  chase: {
    from: statesWhere("chaseable"),
    to: "same",
    sequenceUp: "never",
    note: null,
    mail: "chase",
  },
  extend: {
    from: ["confirmed"],
    to: "same",
    sequenceUp: "always",
    note: "trades",
    mail: null,
  },
} as const satisfies Record<string, BookingAction>;

export type BookingActionName = keyof typeof bookingActions;

/** Whether `action` may start from `state`. */
export function actionAllowed(
  action: BookingActionName,
  state: BookingState,
): boolean {
  return (bookingActions[action].from as readonly BookingState[]).includes(
    state,
  );
}
