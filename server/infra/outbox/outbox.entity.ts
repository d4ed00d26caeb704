import { Column, Entity, Index } from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  InstantColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";

export type OutboxState = "pending" | "sending" | "sent" | "failed";

/** An iCalendar part for nodemailer's `icalEvent` (RFC 6047 §2.4: `text/calendar; method=…`). */
export interface OutboxCalendar {
  method: string;
  content: string;
  filename: string;
}

/**
 * One e-mail waiting for, or past, delivery. Written in the transaction of the change that causes
 * it; sent by `OutboxWorker` (see outbox.ts).
 */
@Entity("outbox_messages")
@Index("ix_outbox_due", ["state", "nextAttemptAt"])
// Pruning takes the oldest sent rows (pruneSentMail); the attention list a workshop's failed ones.
@Index("ix_outbox_sent", ["state", "sentAt"])
@Index("ix_outbox_workshop_state", ["workshopId", "state"])
export class OutboxMessage {
  @IdColumn() id!: string;
  @RefColumn({ nullable: true }) workshopId!: string | null;
  /** RFC 5322 §3.6.4, angle brackets included; made once at enqueue, reused on every attempt. */
  @Index("uq_outbox_message_id", { unique: true })
  @TextColumn(255)
  messageId!: string;
  /** RFC 5321 §4.5.3.1: a 64-octet local part, "@", a 255-octet domain. */
  @TextColumn(320) to!: string;
  /** RFC 5322 §2.1.1: a line is at most 998 characters. */
  @TextColumn(998) subject!: string;
  @Column({ type: "mediumtext" }) text!: string;
  @Column({ type: "mediumtext", nullable: true }) html!: string | null;
  @JsonColumn({ nullable: true }) calendar!: OutboxCalendar | null;
  @Column({
    type: "enum",
    enum: ["pending", "sending", "sent", "failed"],
    default: "pending",
  })
  state!: OutboxState;
  @Column({ type: "int", default: 0 }) attempts!: number;
  @InstantColumn() nextAttemptAt!: Date;
  @Column({ type: "text", nullable: true }) lastError!: string | null;
  /** When the last failed attempt ended (the database's clock); what "last tried" reads. */
  @InstantColumn({ nullable: true }) lastAttemptAt!: Date | null;
  @TextColumn(100, { nullable: true }) claimedBy!: string | null;
  @InstantColumn({ nullable: true }) claimedAt!: Date | null;
  @InstantColumn({ nullable: true }) sentAt!: Date | null;
  @CreatedColumn() createdAt!: Date;
}
