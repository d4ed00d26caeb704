import { Entity, Index, JoinColumn, ManyToOne, type Relation } from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  InstantColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";
import { User } from "../users/users.entity";

/** A person's secret calendar-subscription URL (issue 6). Only the token's hash is kept. */
@Entity("calendar_feeds")
export class CalendarFeed {
  @IdColumn() id!: string;
  @Index("ix_calendar_feeds_user")
  @RefColumn()
  userId!: string;
  /** SHA-256 (hex) of a random 32-byte base64url token; the token itself is shown once. */
  @Index("uq_calendar_feeds_token", { unique: true })
  @TextColumn(64)
  tokenHash!: string;
  @CreatedColumn() createdAt!: Date;
  @InstantColumn({ nullable: true }) revokedAt!: Date | null;

  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
}
