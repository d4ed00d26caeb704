import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryColumn,
  type Relation,
} from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import {
  drawingKinds,
  type DrawingKind,
  type TradeKind,
} from "../../../shared/schemas";
import { StoredFile } from "../files/files.entity";
import { Job } from "../jobs/jobs.entity";
import { Task } from "../programme/programme.entity";
import { Workshop } from "../workshops/workshops.entity";

/**
 * A drawing, template or site photo on a job. Its revisions (Rev A, Rev B …) are kept; the latest
 * is `currentRevision`. Sharing: the workshop always; trades on the job by kind or by name; the
 * customer when `shareWithCustomer`; a trade who made it, always (while on the job).
 */
@Entity("drawings")
export class Drawing {
  @IdColumn() id!: string;
  @Index("ix_drawings_workshop")
  @RefColumn()
  workshopId!: string;
  @Index("ix_drawings_job")
  @RefColumn()
  jobId!: string;
  @TextColumn(160) title!: string;
  @Column({ type: "enum", enum: drawingKinds }) kind!: DrawingKind;
  /** The latest revision's letter (A … Z). */
  @TextColumn(1) currentRevision!: string;
  @JsonColumn() shareTradeKinds!: TradeKind[];
  /** Named trades (trade record ids of this workshop). */
  @JsonColumn() shareTradeIds!: string[];
  @Column({ type: "boolean", default: false }) shareWithCustomer!: boolean;
  @RefColumn() createdByUserId!: string;
  /** Set when a trade uploaded it: that trade always sees it (while on the job) and may add revisions. */
  @RefColumn({ nullable: true }) createdByTradeId!: string | null;
  @CreatedColumn() createdAt!: Date;
  @UpdatedColumn() updatedAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
}

/** One upload of a drawing: who, when, why (the note) and the stored file. */
@Entity("drawing_revisions")
@Index("uq_drawing_revisions_letter", ["drawingId", "letter"], {
  unique: true,
})
export class DrawingRevision {
  @IdColumn() id!: string;
  @RefColumn() drawingId!: string;
  @TextColumn(1) letter!: string;
  @TextColumn(1000) note!: string;
  @Index("ix_drawing_revisions_file")
  @RefColumn()
  fileId!: string;
  @RefColumn() uploadedByUserId!: string;
  @RefColumn({ nullable: true }) uploadedByTradeId!: string | null;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Drawing, { onDelete: "CASCADE" })
  @JoinColumn({ name: "drawingId" })
  drawing?: Relation<Drawing>;
  // RESTRICT: a stored file goes only after its revision (deleting a drawing removes both).
  @ManyToOne(() => StoredFile, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "fileId" })
  file?: Relation<StoredFile>;
}

/** Which tasks of the job a drawing is for (one or more). */
@Entity("drawing_tasks")
export class DrawingTask {
  @PrimaryColumn({ type: "char", length: 36 }) drawingId!: string;
  @Index("ix_drawing_tasks_task")
  @PrimaryColumn({ type: "char", length: 36 })
  taskId!: string;

  @ManyToOne(() => Drawing, { onDelete: "CASCADE" })
  @JoinColumn({ name: "drawingId" })
  drawing?: Relation<Drawing>;
  @ManyToOne(() => Task, { onDelete: "CASCADE" })
  @JoinColumn({ name: "taskId" })
  task?: Relation<Task>;
}
