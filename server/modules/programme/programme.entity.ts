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
  JsonColumn,
  LocalDateColumn,
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import { Job } from "../jobs/jobs.entity";
import { partySchema, type Party } from "../../../shared/schemas";

export const hazardKinds = ["electrical", "height", "tall-unit"] as const;
export type Hazard = (typeof hazardKinds)[number];

/** One piece of work by one party (the workshop or one trade kind) in a job's programme. */
@Entity("tasks")
@Index("ix_tasks_job_order", ["jobId", "sortOrder"])
export class Task {
  @IdColumn() id!: string;
  @Index("ix_tasks_workshop")
  @RefColumn()
  workshopId!: string;
  @RefColumn() jobId!: string;
  @TextColumn(160) name!: string;
  @Column({ type: "enum", enum: partySchema.options }) party!: Party;
  /** Working days, in steps of 0.5 (one slot). */
  @Column({ type: "decimal", precision: 5, scale: 1 }) durationDays!: string;
  @LocalDateColumn({ nullable: true }) notEarlierThan!: string | null;
  /** A local date (that morning) or date-time on a slot boundary. */
  @TextColumn(16, { nullable: true }) actualStart!: string | null;
  @TextColumn(16, { nullable: true }) actualFinish!: string | null;
  /** Shown to the customer as "what to prepare". */
  @Column({ type: "text" }) customerNote!: string;
  /** Workshop only. */
  @Column({ type: "text" }) internalNote!: string;
  @JsonColumn() hazards!: Hazard[];
  @Column({ type: "int" }) sortOrder!: number;
  @CreatedColumn() createdAt!: Date;
  @UpdatedColumn() updatedAt!: Date;

  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
}

/** "Waits for": the successor `toTaskId` waits for the predecessor `fromTaskId`. */
@Entity("task_links")
@Index("uq_task_links", ["fromTaskId", "toTaskId"], { unique: true })
export class TaskLink {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @Index("ix_task_links_job")
  @RefColumn()
  jobId!: string;
  @RefColumn() fromTaskId!: string;
  @Index("ix_task_links_to")
  @RefColumn()
  toTaskId!: string;
  @Column({ type: "enum", enum: ["FS", "SS", "FF"] }) kind!: "FS" | "SS" | "FF";
  @Column({ type: "decimal", precision: 6, scale: 1 }) lag!: string;
  @Column({ type: "enum", enum: ["workingDays", "elapsedHours"] }) lagUnit!:
    "workingDays" | "elapsedHours";
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
  @ManyToOne(() => Task, { onDelete: "CASCADE" })
  @JoinColumn({ name: "fromTaskId" })
  from?: Relation<Task>;
  @ManyToOne(() => Task, { onDelete: "CASCADE" })
  @JoinColumn({ name: "toTaskId" })
  to?: Relation<Task>;
}
