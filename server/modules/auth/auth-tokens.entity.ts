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
  InstantColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";
import { User } from "../users/users.entity";

export type TokenGrant =
  | { role: "owner" | "fitter"; workshopId: string }
  | { role: "trade"; workshopId: string; tradeId: string }
  | { role: "customer"; workshopId: string; customerId: string }
  | { role: null };

/** A single-use, expiring link (invitation, password reset, address check); only its SHA-256 is stored. */
@Entity("auth_tokens")
export class AuthToken {
  @IdColumn() id!: string;
  @Index("uq_auth_tokens_hash", { unique: true })
  @TextColumn(64)
  tokenHash!: string;
  @Column({
    type: "enum",
    enum: ["invitation", "password-reset", "verify-email"],
  })
  kind!: "invitation" | "password-reset" | "verify-email";
  @Index("ix_auth_tokens_user")
  @RefColumn()
  userId!: string;
  @RefColumn({ nullable: true }) workshopId!: string | null;
  @RefColumn({ nullable: true }) invitedByUserId!: string | null;
  @JsonColumn() grant!: TokenGrant;
  @InstantColumn() expiresAt!: Date;
  @InstantColumn({ nullable: true }) usedAt!: Date | null;
  /** Set when another link of the person's set their password first (the newer one wins). */
  @InstantColumn({ nullable: true }) voidedAt!: Date | null;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
}
