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
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import { Job } from "../jobs/jobs.entity";
import { Task } from "../programme/programme.entity";
import { Trade } from "../trades/trades.entity";
import {
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
