import { User } from "../modules/users/users.entity";
import {
  Workshop,
  WorkshopMember,
} from "../modules/workshops/workshops.entity";
import { Trade, TradeMember } from "../modules/trades/trades.entity";
import { Customer } from "../modules/customers/customers.entity";
import { Job } from "../modules/jobs/jobs.entity";
import { Task, TaskLink } from "../modules/programme/programme.entity";
import { Booking, BookingEvent } from "../modules/bookings/bookings.entity";
import { AuditEntry } from "../modules/audit/audit.entity";
import { AuthToken } from "../modules/auth/auth-tokens.entity";
import { ProgrammeStarter } from "../modules/starters/starters.entity";
import { OutboxMessage } from "../infra/outbox/outbox.entity";
import { CalendarFeed } from "../modules/feeds/feeds.entity";
import {
  ThreadAttachment,
  ThreadMessage,
  ThreadNotice,
  ThreadRead,
} from "../modules/thread/thread.entity";
import { StoredFile } from "../modules/files/files.entity";
import {
  Drawing,
  DrawingRevision,
  DrawingTask,
} from "../modules/drawings/drawings.entity";
import { TimelineView } from "../modules/timeline/timeline.entity";

/** Every entity, listed once (the data source and tests use this list). */
export const entities = [
  User,
  Workshop,
  WorkshopMember,
  Trade,
  TradeMember,
  Customer,
  Job,
  Task,
  TaskLink,
  Booking,
  BookingEvent,
  AuditEntry,
  AuthToken,
  ProgrammeStarter,
  OutboxMessage,
  CalendarFeed,
  ThreadMessage,
  ThreadAttachment,
  ThreadRead,
  ThreadNotice,
  StoredFile,
  Drawing,
  DrawingRevision,
  DrawingTask,
  TimelineView,
];
