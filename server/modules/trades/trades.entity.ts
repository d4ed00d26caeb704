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
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import { Workshop } from "../workshops/workshops.entity";
import { User } from "../users/users.entity";
import { tradeKinds, type TradeKind } from "../../../shared/schemas";

/** A trade business as one workshop knows it (its own contact details and calendar settings). */
@Entity("trades")
@Index("ix_trades_workshop_kind", ["workshopId", "kind"])
export class Trade {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @TextColumn(120) businessName!: string;
  @Column({ type: "enum", enum: tradeKinds }) kind!: TradeKind;
  @TextColumn(120) contactName!: string;
  @TextColumn(254) email!: string;
  @TextColumn(24) phone!: string;
  @JsonColumn() workingWeekdays!: number[];
  @TextColumn(5) dayStart!: string;
  @TextColumn(5) dayEnd!: string;
  /** Local dates the trade does not work. */
  @JsonColumn() daysOff!: string[];
  @CreatedColumn() createdAt!: Date;
  @UpdatedColumn() updatedAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
}

/** Links the person who speaks for a trade to that trade's record in a workshop (one user, many workshops). */
@Entity("trade_members")
@Index("uq_trade_members", ["tradeId", "userId"], { unique: true })
export class TradeMember {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @RefColumn() tradeId!: string;
  @Index("ix_trade_members_user")
  @RefColumn()
  userId!: string;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
  @ManyToOne(() => Trade, { onDelete: "CASCADE" })
  @JoinColumn({ name: "tradeId" })
  trade?: Relation<Trade>;
  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
}
