import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryGeneratedColumn,
  type Relation,
} from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  InstantColumn,
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import { threadAudiences, type ThreadAudience } from "../../../shared/schemas";
import { Job } from "../jobs/jobs.entity";
import { StoredFile } from "../files/files.entity";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";

export const threadMessageKinds = ["message", "system"] as const;
export type ThreadMessageKind = (typeof threadMessageKinds)[number];
export const threadAuthorRoles = ["workshop", "trade", "customer"] as const;
export type ThreadAuthorRole = (typeof threadAuthorRoles)[number];

/**
 * One message in a job's thread, in exactly one audience. `seq` is the primary key because it is
 * an AUTO_INCREMENT: it only grows. Every insert first locks the job's row (thread-notes.ts), so
 * within one job seq order is also commit order and `?after=<seq>` is an exact cursor for every
 * app process (nothing about the thread lives in one process's memory). The API shows the UUID.
 */
@Entity("thread_messages")
@Index("ix_thread_messages_job_seq", ["jobId", "seq"])
export class ThreadMessage {
  /** bigint comes back from mysql2 as a string; `Number()` it (2^53 is far away). */
  @PrimaryGeneratedColumn({ type: "bigint" }) seq!: string;
  @Index("uq_thread_messages_id", { unique: true })
  @RefColumn()
  id!: string;
  @RefColumn() workshopId!: string;
  @RefColumn() jobId!: string;
  @Column({ type: "enum", enum: threadAudiences }) audience!: ThreadAudience;
  @Column({ type: "enum", enum: threadMessageKinds }) kind!: ThreadMessageKind;
  /** Plain text as typed (trimmed); never HTML. */
  @Column({ type: "text" }) text!: string;
  /** Null for system notes (and if the author's account is removed). */
  @Index("ix_thread_messages_author")
  @RefColumn({ nullable: true })
  authorUserId!: string | null;
  /** The author as shown when they wrote it: name, and "Workshop" / trade business name / "Customer". */
  @TextColumn(120, { nullable: true }) authorName!: string | null;
  @TextColumn(120, { nullable: true }) authorLabel!: string | null;
  @Column({ type: "enum", enum: threadAuthorRoles, nullable: true })
  authorRole!: ThreadAuthorRole | null;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "authorUserId" })
  author?: Relation<User>;
}

/** A stored file carried by one message (a file belongs to one message only). */
@Entity("thread_attachments")
@Index("ix_thread_attachments_message", ["messageSeq", "position"])
export class ThreadAttachment {
  @IdColumn() id!: string;
  @Column({ type: "bigint" }) messageSeq!: string;
  @Index("uq_thread_attachments_file", { unique: true })
  @RefColumn()
  fileId!: string;
  @Column({ type: "int" }) position!: number;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => ThreadMessage, { onDelete: "CASCADE" })
  @JoinColumn({ name: "messageSeq", referencedColumnName: "seq" })
  message?: Relation<ThreadMessage>;
  @ManyToOne(() => StoredFile, { onDelete: "CASCADE" })
  @JoinColumn({ name: "fileId" })
  file?: Relation<StoredFile>;
}

/** How far one person has read one job's thread: messages with a larger `seq` are unread. */
@Entity("thread_reads")
@Index("uq_thread_reads_user_job", ["userId", "jobId"], { unique: true })
export class ThreadRead {
  @IdColumn() id!: string;
  @RefColumn() userId!: string;
  @Index("ix_thread_reads_job")
  @RefColumn()
  jobId!: string;
  @Column({ type: "bigint", default: 0 }) lastReadSeq!: string;
  @UpdatedColumn() updatedAt!: Date;

  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
}

/**
 * The e-mail notice owed to one person about one job's thread. A new message sets `dueAt` (if
 * not set already), so every message within the window goes out in one e-mail; the sweep claims a
 * due row by the UPDATE that clears `dueAt`, so two processes never both send it.
 */
@Entity("thread_notices")
@Index("uq_thread_notices_user_job", ["userId", "jobId"], { unique: true })
export class ThreadNotice {
  @IdColumn() id!: string;
  @RefColumn() userId!: string;
  @Index("ix_thread_notices_job")
  @RefColumn()
  jobId!: string;
  @Index("ix_thread_notices_due")
  @InstantColumn({ nullable: true })
  dueAt!: Date | null;
  /** The last message already in an e-mail to this person. */
  @Column({ type: "bigint", default: 0 }) lastNoticedSeq!: string;
  @InstantColumn({ nullable: true }) lastSentAt!: Date | null;

  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "jobId" })
  job?: Relation<Job>;
}
