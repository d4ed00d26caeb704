import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  type Relation,
} from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  LocalDateTimeColumn,
  InstantColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import { Job } from "../jobs/jobs.entity";
import { Task } from "../programme/programme.entity";
import { Trade } from "../trades/trades.entity";
import {
  bookingChannels,
  type BookingChannel,
  arrivalWindows,
  bookingStates,
  type BookingState,
} from "../../../shared/schemas";

/** A task offered to a named trade for given dates. */
@Entity("bookings")
@Index("ix_bookings_trade_start", ["tradeId", "start"])
export class Booking {
  @IdColumn() id!: string;
  @Index("ix_bookings_workshop")
  @RefColumn()
  workshopId!: string;
  @Index("ix_bookings_job")
  @RefColumn()
  jobId!: string;
  @Index("ix_bookings_task")
  @RefColumn()
  taskId!: string;
  @RefColumn() tradeId!: string;
  @Column({ type: "enum", enum: bookingStates }) state!: BookingState;
  @LocalDateTimeColumn() start!: string;
  @LocalDateTimeColumn() finish!: string;
  @Column({ type: "enum", enum: arrivalWindows })
  arrivalWindow!: (typeof arrivalWindows)[number];
  @TextColumn(5, { nullable: true }) arrivalFrom!: string | null;
  @TextColumn(5, { nullable: true }) arrivalTo!: string | null;
  /** RFC 5545 UID: random, revealing nothing about people or hosts (RFC 7986 §5.3). */
  @TextColumn(64) icalUid!: string;
  /** Start the trade proposed instead (state date-proposed). */
  @LocalDateTimeColumn({ nullable: true }) proposedStart!: string | null;
  /** The maker chose to show the full address and access notes before confirmation. */
  @Column({ type: "boolean", default: false }) shareAddress!: boolean;
  /** Why the maker booked despite a clash or a day off. */
  @Column({ type: "text", nullable: true }) overrideReason!: string | null;
  /** SHA-256 of the current confirmation link's token (the token itself is never stored). */
  @Index("uq_bookings_link_token", { unique: true })
  @TextColumn(64, { nullable: true })
  linkTokenHash!: string | null;
  @InstantColumn({ nullable: true }) linkExpiresAt!: Date | null;
  /** The start the current link was issued for: a link from before a date change cannot confirm. */
  @LocalDateTimeColumn({ nullable: true }) linkForStart!: string | null;
  @InstantColumn({ nullable: true }) sentAt!: Date | null;
  @InstantColumn({ nullable: true }) answeredAt!: Date | null;
  @InstantColumn({ nullable: true }) reminderSentAt!: Date | null;
  @InstantColumn({ nullable: true }) chasedAt!: Date | null;
  /** RFC 5546 §2.1.4 SEQUENCE. */
  @Column({ type: "int" }) sequence!: number;
  @CreatedColumn() createdAt!: Date;
  @UpdatedColumn() updatedAt!: Date;

  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
  @ManyToOne(() => Task, { onDelete: "CASCADE" })
  @JoinColumn({ name: "taskId" })
  task?: Relation<Task>;
  @ManyToOne(() => Trade, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "tradeId" })
  trade?: Relation<Trade>;
}

/** Every change of a booking's state: who, when, how (link, phone, calendar app…) and why. */
@Entity("booking_events")
@Index("ix_booking_events_booking", ["bookingId", "createdAt"])
export class BookingEvent {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @RefColumn() bookingId!: string;
  @Column({ type: "enum", enum: bookingStates, nullable: true })
  fromState!: BookingState | null;
  @Column({ type: "enum", enum: bookingStates }) toState!: BookingState;
  /** A signed-in person, or null when the trade answered by link or from their calendar app. */
  @RefColumn({ nullable: true }) actorUserId!: string | null;
  @Column({ type: "enum", enum: bookingChannels }) channel!: BookingChannel;
  @Column({ type: "text" }) note!: string;
  @JsonColumn() detail!: Record<string, unknown>;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Booking, { onDelete: "CASCADE" })
  @JoinColumn({ name: "bookingId" })
  booking?: Relation<Booking>;
}
