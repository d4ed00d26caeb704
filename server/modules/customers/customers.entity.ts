import { Entity, Index, JoinColumn, ManyToOne, type Relation } from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";
import { Workshop } from "../workshops/workshops.entity";
import { User } from "../users/users.entity";

/** The householder, as the workshop knows them; `userId` once they have an account. */
@Entity("customers")
export class Customer {
  @IdColumn() id!: string;
  @Index("ix_customers_workshop")
  @RefColumn()
  workshopId!: string;
  @TextColumn(120) name!: string;
  @TextColumn(254) email!: string;
  @TextColumn(24, { nullable: true }) phone!: string | null;
  @Index("ix_customers_user")
  @RefColumn({ nullable: true })
  userId!: string | null;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
}
