import { Initial1764633600000 } from "./1764633600000-initial";
import { ProgrammeStarters1764720000000 } from "./1764720000000-programme-starters";
import { BookingAnswers1764806400000 } from "./1764806400000-booking-answers";
import { Outbox1764892800000 } from "./1764892800000-outbox";
import { CalendarFeeds1764979200000 } from "./1764979200000-calendar-feeds";
import { Thread1765238400000 } from "./1765238400000-Thread";
import { StoredFiles1765065600000 } from "./1765065600000-stored-files";
import { Drawings1765152000000 } from "./1765152000000-Drawings";
import { TimelineViews1765324800000 } from "./1765324800000-timeline-views";
import { OutboxFailures1765411200000 } from "./1765411200000-outbox-failures";
import { AuthHardening1765513200000 } from "./1765513200000-auth-hardening";
import { SignUp1765600000000 } from "./1765600000000-sign-up";
import { WorkshopSettings1765600100000 } from "./1765600100000-workshop-settings";

/** Migration classes in order (classes, not a glob, so vitest and tsx load them alike). */
export const migrations = [
  Initial1764633600000,
  ProgrammeStarters1764720000000,
  BookingAnswers1764806400000,
  Outbox1764892800000,
  CalendarFeeds1764979200000,
  StoredFiles1765065600000,
  Drawings1765152000000,
  Thread1765238400000,
  TimelineViews1765324800000,
  OutboxFailures1765411200000,
  AuthHardening1765513200000,
  SignUp1765600000000,
  WorkshopSettings1765600100000,
];
