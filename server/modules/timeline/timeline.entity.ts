import { Entity, Index, JoinColumn, ManyToOne, type Relation } from "typeorm";
import {
  IdColumn,
  InstantColumn,
  JsonColumn,
  RefColumn,
} from "../../db/columns";
import { Job } from "../jobs/jobs.entity";
import { User } from "../users/users.entity";

/** A visit as the person saw it: enough to say "was Tue 12 Jan, morning". */
export interface SeenVisit {
  start: string;
  finish: string;
  window: "morning" | "afternoon" | "all-day" | "range";
  from: string | null;
  to: string | null;
}

/** What the timeline showed when the person last looked. */
export interface SeenTimeline {
  visits: Record<string, SeenVisit>;
  handoverDate: string | null;
}

/**
 * When one person last looked at one job's timeline, and what it showed then. Changes since are
 * what differs from this snapshot (a moved or new visit, a new handover date).
 */
@Entity("timeline_views")
@Index("uq_timeline_views_user_job", ["userId", "jobId"], { unique: true })
export class TimelineView {
  @IdColumn() id!: string;
  @RefColumn() userId!: string;
  @Index("ix_timeline_views_job")
  @RefColumn()
  jobId!: string;
  @InstantColumn() seenAt!: Date;
  @JsonColumn() seen!: SeenTimeline;

  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
}
