import { Column, Entity, Index } from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  InstantColumn,
  TextColumn,
} from "../../db/columns";

/** A person who can sign in. What they may see comes from memberships, trade links and customer records. */
@Entity("users")
export class User {
  @IdColumn() id!: string;
  @Index("uq_users_email", { unique: true })
  @TextColumn(254)
  email!: string;
  @TextColumn(120) name!: string;
  /** argon2id hash; null until the invitation is accepted. */
  @TextColumn(255, { nullable: true }) passwordHash!: string | null;
  @InstantColumn({ nullable: true }) lastSignInAt!: Date | null;
  /**
   * When the person proved they receive mail at `email` (a verification, invitation or reset
   * link). Null after sign-up until then; the outbox sends nothing for a workshop with no
   * verified owner (issue 14, DEVELOPERS.md "Unverified owners send nothing").
   */
  @InstantColumn({ nullable: true }) emailVerifiedAt!: Date | null;
  /**
   * Goes up when the password is set (reset, invitation, change); a session signed in under an
   * older generation is no longer signed in (OWASP ASVS v4.0.3 3.3.3). See DEVELOPERS.md.
   */
  @Column({ type: "int", default: 0 }) sessionGeneration!: number;
  @CreatedColumn() createdAt!: Date;
}
